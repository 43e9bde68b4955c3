package lbm

import (
	"math"
	"runtime"
	"testing"
)

// TestPoolSpinBacksOff: after a run of failed full spins (cores taken by
// other processes) the pool spins briefly, probing with a full spin one
// wait in spinProbe; after successful probes it spins fully again.
func TestPoolSpinBacksOff(t *testing.T) {
	p := newPool(8, 2)
	defer p.close()
	if l, full := p.spinLimit(); l != spinWait || !full {
		t.Fatalf("fresh pool: limit %d (full %v), want %d", l, full, spinWait)
	}
	for range 8 {
		p.spun(true) // 8 misses in a row: rate 1-(31/32)^8 = 22%
	}
	short, probes := 0, 0
	for range 4 * spinProbe {
		switch l, full := p.spinLimit(); {
		case full && l == spinWait:
			probes++
		case l == spinMin:
			short++
		}
	}
	if probes != 4 || short != 4*spinProbe-4 {
		t.Errorf("under load: %d full probes and %d short spins in %d waits, want 4 and %d", probes, short, 4*spinProbe, 4*spinProbe-4)
	}
	for range 64 {
		p.spun(false) // probes that hit: the rate decays below 10%
	}
	if l, full := p.spinLimit(); l != spinWait || !full {
		t.Errorf("cores free again: limit %d, want %d", l, spinWait)
	}
}

// TestPoolCrowded: a solver with more goroutines than GOMAXPROCS (the pool
// then yields its P in the waits instead of pausing) gives the same bits
// as one goroutine, and says it is crowded.
func TestPoolCrowded(t *testing.T) {
	old := runtime.GOMAXPROCS(1)
	defer runtime.GOMAXPROCS(old)
	var pops [2][]float64
	for i, threads := range []int{1, 4} {
		s, err := New(Config{Nz: 40, Nr: 16, Tau: 0.7, Axisymmetric: true, Threads: threads})
		if err != nil {
			t.Fatal(err)
		}
		randomState(s, 3)
		for range 20 {
			s.Step()
		}
		if threads > 1 && !s.pool.crowded.Load() {
			t.Errorf("%d goroutines with GOMAXPROCS 1: the pool does not know it is crowded", threads)
		}
		for q := range Q {
			for n := range s.planeLen() {
				pops[i] = append(pops[i], s.pop(q, n))
			}
		}
		s.Close()
	}
	for n := range pops[0] {
		if math.Float64bits(pops[0][n]) != math.Float64bits(pops[1][n]) {
			t.Fatalf("population %d: %v with 1 goroutine, %v with 4 on one P", n, pops[0][n], pops[1][n])
		}
	}
}
