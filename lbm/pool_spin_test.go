package lbm

import "testing"

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
