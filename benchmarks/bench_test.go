package main

import (
	"flag"
	"fmt"
	"math"
	"os"
	"strings"
	"sync"
	"testing"
	"time"

	"axiswim/lbm"
)

// The benchmark grids: 256x128, 960x240 and 4096x1024 by default; -grids
// (after -args) or AXISWIM_BENCH_GRIDS may name others, e.g. "all" or
// "512x256,2048x1024".
var benchGridsFlag = flag.String("grids", "", `benchmark grids NZxNR, comma-separated, or "all" (default 256x128,960x240,4096x1024; env AXISWIM_BENCH_GRIDS)`)

func benchGrids(b *testing.B) []grid {
	s := *benchGridsFlag
	if s == "" {
		s = os.Getenv("AXISWIM_BENCH_GRIDS")
	}
	gs, err := parseGrids(s)
	if err != nil {
		b.Fatal(err)
	}
	return gs
}

func BenchmarkPlanarBGK(b *testing.B)       { benchKernel(b, kernels[0]) }
func BenchmarkAxisymmetricTRT(b *testing.B) { benchKernel(b, kernels[1]) }

// benchKernel runs kernel k as sub-benchmarks GRID/threads=N, reporting
// MLUPS = Nz*Nr*b.N/seconds/1e6 and the allocations per step.
func benchKernel(b *testing.B, k kernel) {
	for _, g := range benchGrids(b) {
		b.Run(g.String(), func(b *testing.B) {
			for _, n := range threadCounts() {
				b.Run(fmt.Sprintf("threads=%d", n), func(b *testing.B) {
					s, err := newSolver(k, g, n) // includes the warm-up steps
					if err != nil {
						b.Fatal(err)
					}
					defer s.Close()
					b.ReportAllocs()
					for b.Loop() {
						s.Step()
					}
					b.ReportMetric(mlups(g.cells(), b.N, b.Elapsed()), "MLUPS")
				})
			}
		})
	}
}

// The triad arrays are made once and shared by the sub-benchmarks.
var (
	benchTriadOnce sync.Once
	benchTriad     *triad
)

// BenchmarkTriad runs the STREAM triad on 3 x 512 MiB arrays with 1
// goroutine and with all, reporting GB/s at 24 bytes per element.
func BenchmarkTriad(b *testing.B) {
	benchTriadOnce.Do(func() {
		ts := threadCounts()
		benchTriad = newTriad(defaultTriadMiB<<20/8, ts[len(ts)-1])
	})
	t := benchTriad
	for _, n := range threadCounts() {
		b.Run(fmt.Sprintf("threads=%d", n), func(b *testing.B) {
			t.run(n) // warm-up pass
			for b.Loop() {
				t.run(n)
			}
			b.ReportMetric(float64(t.bytes())*float64(b.N)/b.Elapsed().Seconds()/1e9, "GB/s")
		})
	}
}

func positiveFinite(v float64) bool { return v > 0 && !math.IsInf(v, 0) && !math.IsNaN(v) }

// TestHelpers checks on tiny sizes that the triad computes a = b + s*c and
// that the triad and kernel measurements give positive finite rates.
func TestHelpers(t *testing.T) {
	for _, n := range []int{1, 2, 4} {
		tr := newTriad(1000+n, n)
		bw := tr.measure(n, 2)
		if !positiveFinite(bw) {
			t.Errorf("triad threads=%d: bandwidth %v", n, bw)
		}
		for i, v := range tr.a {
			if want := tr.b[i] + triadScalar*tr.c[i]; v != want {
				t.Fatalf("triad threads=%d: a[%d] = %v, want %v", n, i, v, want)
			}
		}
	}
	for _, k := range pathKernels(lbm.Kernels()) {
		for _, n := range []int{1, 2} {
			res, err := measureKernel(k, grid{16, 8}, n, 10*time.Millisecond)
			if err != nil {
				t.Fatalf("%s on %s threads=%d: %v", k.name, k.path, n, err)
			}
			if !positiveFinite(res.mlups) || res.steps < 3 || res.threads != n {
				t.Errorf("%s threads=%d: %+v", k.name, n, res)
			}
		}
	}
}

func TestParseGrids(t *testing.T) {
	for in, want := range map[string]string{
		"":                  "256x128,960x240,4096x1024",
		"all":               "256x128,512x256,960x240,2048x1024,4096x1024",
		" 256x128, 64x32 ,": "256x128,64x32",
	} {
		gs, err := parseGrids(in)
		if err != nil {
			t.Errorf("parseGrids(%q): %v", in, err)
			continue
		}
		var names []string
		for _, g := range gs {
			names = append(names, g.String())
		}
		if got := strings.Join(names, ","); got != want {
			t.Errorf("parseGrids(%q) = %s, want %s", in, got, want)
		}
	}
	for _, bad := range []string{"512", "512x", "0x4", "axb", ","} {
		if _, err := parseGrids(bad); err == nil {
			t.Errorf("parseGrids(%q): no error", bad)
		}
	}
}

func TestCacheSize(t *testing.T) {
	for in, want := range map[string]int{"32768K": 32 << 20, "1M": 1 << 20, "512": 512, "x": 0, "": 0} {
		if got := parseCacheSize(in); got != want {
			t.Errorf("parseCacheSize(%q) = %d, want %d", in, got, want)
		}
	}
	if c := lastLevelCache(); c < 0 {
		t.Errorf("lastLevelCache = %d", c)
	}
}
