package lbm

import (
	"fmt"
	"slices"
	"strings"
	"testing"
)

// TestKernelPaths: every path can be named in Config.Kernel and in
// AXISWIM_KERNEL; New runs it when this processor and build can, and
// otherwise fails with an error that names the path and what can run.
func TestKernelPaths(t *testing.T) {
	ks := Kernels()
	if ks[len(ks)-1] != KernelPortable {
		t.Fatalf("Kernels() = %v: the portable path must be last", ks)
	}
	if FastestKernel() != ks[0] {
		t.Errorf("FastestKernel() = %s, Kernels() = %v", FastestKernel(), ks)
	}
	for _, k := range allKernels {
		cfg := Config{Nz: 9, Nr: 5, Tau: 0.8, Axisymmetric: true, Threads: 1, Kernel: k}
		s, err := New(cfg)
		switch {
		case slices.Contains(ks, k) && err != nil:
			t.Errorf("Kernel %s, which this machine runs: %v", k, err)
		case slices.Contains(ks, k):
			if s.Kernel() != k {
				t.Errorf("Kernel %s: the solver runs %s", k, s.Kernel())
			}
			s.Close()
		case err == nil:
			t.Errorf("Kernel %s, which this machine cannot run: no error", k)
			s.Close()
		case !strings.Contains(err.Error(), string(k)):
			t.Errorf("Kernel %s: the error does not name the path: %v", k, err)
		}

		t.Setenv(KernelEnv, strings.ToUpper(string(k))) // case does not matter
		cfg.Kernel = KernelAuto
		s, err = New(cfg)
		switch {
		case slices.Contains(ks, k) && err != nil:
			t.Errorf("%s=%s: %v", KernelEnv, k, err)
		case slices.Contains(ks, k):
			if s.Kernel() != k {
				t.Errorf("%s=%s: the solver runs %s", KernelEnv, k, s.Kernel())
			}
			s.Close()
		case err == nil:
			t.Errorf("%s=%s, which this machine cannot run: no error", KernelEnv, k)
			s.Close()
		case !strings.Contains(err.Error(), KernelEnv):
			t.Errorf("%s=%s: the error does not name the variable: %v", KernelEnv, k, err)
		}
	}

	t.Setenv(KernelEnv, "")
	if k, err := ResolveKernel(KernelAuto); err != nil || k != ks[0] {
		t.Errorf("unset %s: %s, %v; want the fastest, %s", KernelEnv, k, err, ks[0])
	}
	t.Setenv(KernelEnv, "sse9")
	if _, err := New(Config{Nz: 9, Nr: 5, Tau: 0.8, Threads: 1}); err == nil ||
		!strings.Contains(err.Error(), "sse9") || !strings.Contains(err.Error(), "avx512, avx2, portable") {
		t.Errorf("%s=sse9: want an error naming the value and the choices, got %v", KernelEnv, err)
	}
	if _, err := New(Config{Nz: 9, Nr: 5, Tau: 0.8, Threads: 1, Kernel: "avx1024"}); err == nil {
		t.Error("Kernel avx1024: no error")
	}
	// An explicit path wins over the variable.
	if s, err := New(Config{Nz: 9, Nr: 5, Tau: 0.8, Threads: 1, Kernel: KernelPortable}); err != nil {
		t.Errorf("Kernel portable with %s=sse9: %v", KernelEnv, err)
	} else {
		s.Close()
	}
}

func ExampleKernelPath_Describe() {
	for _, k := range []KernelPath{KernelAVX512, KernelAVX2, KernelPortable} {
		fmt.Println(k.Describe())
	}
	// Output:
	// avx512 (SIMD assembly, 8 float64 lanes)
	// avx2 (SIMD assembly, 4 float64 lanes)
	// portable (Go loops)
}
