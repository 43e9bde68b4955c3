package lbm

import (
	"fmt"
	"os"
	"runtime"
	"strings"
)

// KernelPath names one implementation of the fused stream-and-collide
// block loops. All paths do the same arithmetic in the same order and give
// the same bits (TestSIMDMatchesPortable); they differ only in speed.
type KernelPath string

// The kernel paths.
const (
	// KernelAuto is the path named by the environment variable
	// AXISWIM_KERNEL when it is set, else the fastest this processor and
	// build can run (FastestKernel).
	KernelAuto KernelPath = ""
	// KernelPortable is the Go loops of kernel.go, on every processor.
	KernelPortable KernelPath = "portable"
	// KernelAVX2 is the assembly of simd_avx2_amd64.s: four float64 lanes
	// of a 256-bit register (amd64 with AVX2).
	KernelAVX2 KernelPath = "avx2"
	// KernelAVX512 is the assembly of simd_amd64.s: eight float64 lanes of
	// a 512-bit register (amd64 with AVX-512 F and VL).
	KernelAVX512 KernelPath = "avx512"
)

// KernelEnv is the environment variable that chooses the kernel path of
// every solver whose Config leaves Kernel unset (KernelAuto): portable,
// avx2 or avx512. Unset or empty, the fastest path runs.
const KernelEnv = "AXISWIM_KERNEL"

// allKernels lists every path, fastest first.
var allKernels = [...]KernelPath{KernelAVX512, KernelAVX2, KernelPortable}

// Kernels returns the paths this processor and build can run, fastest
// first; the portable path is always last.
func Kernels() []KernelPath {
	var ks []KernelPath
	for _, k := range allKernels {
		if k.runnable() == nil {
			ks = append(ks, k)
		}
	}
	return ks
}

// FastestKernel returns the fastest path this processor and build can run.
func FastestKernel() KernelPath { return Kernels()[0] }

// runnable says why this processor or build cannot run path k, or nil.
func (k KernelPath) runnable() error {
	switch k {
	case KernelPortable:
		return nil
	case KernelAVX2, KernelAVX512:
	default:
		return fmt.Errorf("unknown kernel path %q: choose %s", string(k), KernelNames(allKernels[:]))
	}
	if runtime.GOARCH != "amd64" {
		return fmt.Errorf("kernel path %s is for amd64 processors; this is %s, which has only the portable kernel", k, runtime.GOARCH)
	}
	if !simdBuilt {
		return fmt.Errorf("kernel path %s is not in this build (built with the purego tag, which keeps only the portable kernel); rebuild without -tags purego or choose portable", k)
	}
	if k == KernelAVX2 && !hasAVX2 {
		return fmt.Errorf("kernel path avx2 needs a processor with AVX2; this one has none: choose portable")
	}
	if k == KernelAVX512 && !hasAVX512 {
		alt := "portable"
		if hasAVX2 {
			alt = "avx2 or portable"
		}
		return fmt.Errorf("kernel path avx512 needs a processor with AVX-512 F and VL; this one has none: choose %s", alt)
	}
	return nil
}

// ResolveKernel returns the path a solver with Config.Kernel = k runs:
// k itself, or for KernelAuto the path AXISWIM_KERNEL names, or the
// fastest. It is an error when the path is unknown or this processor or
// build cannot run it; the error says which paths can run.
func ResolveKernel(k KernelPath) (KernelPath, error) {
	if k == KernelAuto {
		v := strings.TrimSpace(os.Getenv(KernelEnv))
		if v == "" {
			return FastestKernel(), nil
		}
		k = KernelPath(strings.ToLower(v))
		if err := k.runnable(); err != nil {
			return "", fmt.Errorf("lbm: %s=%s: %w (paths this machine runs: %s; unset it for the fastest)",
				KernelEnv, v, err, KernelNames(Kernels()))
		}
		return k, nil
	}
	if err := k.runnable(); err != nil {
		return "", fmt.Errorf("lbm: %w (paths this machine runs: %s)", err, KernelNames(Kernels()))
	}
	return k, nil
}

// KernelNames lists paths for messages: "avx512, avx2, portable".
func KernelNames(ks []KernelPath) string {
	s := make([]string, len(ks))
	for i, k := range ks {
		s[i] = string(k)
	}
	return strings.Join(s, ", ")
}

// KernelOrigin says how KernelAuto resolves on this machine: "set by
// AXISWIM_KERNEL=avx2" or "the fastest this processor has".
func KernelOrigin() string {
	if v := strings.TrimSpace(os.Getenv(KernelEnv)); v != "" {
		return "set by " + KernelEnv + "=" + v
	}
	return "the fastest this processor has"
}

// Describe says in a few words what path k is, for reports: "avx2 (SIMD,
// 4 float64 lanes)".
func (k KernelPath) Describe() string {
	switch k {
	case KernelAVX512:
		return "avx512 (SIMD assembly, 8 float64 lanes)"
	case KernelAVX2:
		return "avx2 (SIMD assembly, 4 float64 lanes)"
	case KernelPortable:
		return "portable (Go loops)"
	}
	return string(k)
}
