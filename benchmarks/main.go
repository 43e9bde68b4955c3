package main

import (
	"axiswim/benchmarks/internal/host"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"runtime"
	"runtime/debug"
	"slices"
	"strconv"
	"strings"
	"time"

	"axiswim/lbm"
)

func main() {
	fs := flag.NewFlagSet("benchmarks", flag.ExitOnError)
	gridsFlag := fs.String("grids", "256x128,960x240,4096x1024", `comma-separated grids NZxNR, or "all"`)
	paths := fs.String("kernels", "", `kernel paths to time, comma-separated (portable, avx2, avx512), or "all" the machine runs (default: the one in use, AXISWIM_KERNEL or the fastest)`)
	portable := fs.Bool("portable", false, "also time the portable Go kernel (same as adding portable to -kernels)")
	threadsFlag := fs.String("threads", "", "goroutine counts, comma-separated (default 1 and all cores)")
	seconds := fs.Float64("seconds", 2, "seconds of timing per kernel, grid and goroutine count")
	reps := fs.Int("reps", 10, "triad repetitions (the best is reported)")
	triadMiB := fs.Int("triad-mib", defaultTriadMiB, "size of each of the three triad arrays, MiB")
	fs.Usage = func() {
		fmt.Fprintf(fs.Output(), "usage: go run ./benchmarks [flags]\n\n"+
			"Times the lbm kernel and a STREAM triad and prints one table.\n\n")
		fs.PrintDefaults()
	}
	fs.Parse(os.Args[1:])

	grids, err := parseGrids(*gridsFlag)
	if err != nil {
		fmt.Fprintln(os.Stderr, "benchmarks:", err)
		os.Exit(2)
	}
	ps, err := parsePaths(*paths)
	if err == nil && *portable && !slices.Contains(ps, lbm.KernelPortable) {
		ps = append(ps, lbm.KernelPortable)
	}
	if err != nil {
		fmt.Fprintln(os.Stderr, "benchmarks: -kernels:", err)
		os.Exit(2)
	}
	threads, err := parseThreads(*threadsFlag)
	if err != nil {
		fmt.Fprintln(os.Stderr, "benchmarks: -threads:", err)
		os.Exit(2)
	}
	if *seconds <= 0 || *reps < 1 || *triadMiB < 1 {
		fmt.Fprintln(os.Stderr, "benchmarks: -seconds, -reps and -triad-mib must be positive")
		os.Exit(2)
	}
	cfg := runConfig{
		grids:    grids,
		dur:      time.Duration(*seconds * float64(time.Second)),
		reps:     *reps,
		triadLen: *triadMiB << 20 / 8,
		paths:    ps,
		threads:  threads,
	}
	if err := run(os.Stdout, cfg); err != nil {
		fmt.Fprintln(os.Stderr, "benchmarks:", err)
		os.Exit(1)
	}
}

type runConfig struct {
	grids    []grid
	dur      time.Duration    // timing per kernel measurement
	reps     int              // triad repetitions
	triadLen int              // elements per triad array
	paths    []lbm.KernelPath // kernel paths to time, each with every configuration
	threads  []int            // goroutine counts
}

// run measures the triad and every kernel, grid and goroutine count, and
// prints the machine facts and the table to w.
func run(w io.Writer, cfg runConfig) error {
	threads := cfg.threads
	llc := lastLevelCache()
	start := time.Now()

	fmt.Fprintf(w, "axiswim lbm kernel benchmark, %s\n\n", start.UTC().Format("2006-01-02 15:04 MST"))
	fmt.Fprintf(w, "CPU:    %s\n", host.CPUModel())
	fmt.Fprintf(w, "Cores:  %d (runtime.NumCPU), GOMAXPROCS %d\n", runtime.NumCPU(), runtime.GOMAXPROCS(0))
	fmt.Fprintf(w, "Go:     %s %s/%s\n", runtime.Version(), runtime.GOOS, runtime.GOARCH)
	if llc > 0 {
		fmt.Fprintf(w, "LLC:    %s (last-level cache, all instances)\n", mib(llc))
	} else {
		fmt.Fprintf(w, "LLC:    unknown\n")
	}
	fmt.Fprintf(w, "Triad:  3 x %s arrays, best of %d passes\n", mib(cfg.triadLen*8), cfg.reps)
	fmt.Fprintf(w, "Kernel: %s\n", kernelHeader())
	fmt.Fprintf(w, "Timed:  paths %s; tau %g, periodic ends, force %g; %d warm-up steps, best batch over %v\n",
		lbm.KernelNames(cfg.paths), benchTau, benchForce, warmUpSteps, cfg.dur)
	if llc > 0 && cfg.triadLen*8 < 4*llc {
		fmt.Fprintf(w, "WARNING: each triad array is smaller than 4 x LLC; the triad may measure cache, not DRAM\n")
	}
	fmt.Fprintln(w)

	// Triad first, then free its arrays before the lattices are built.
	tr := newTriad(cfg.triadLen, threads[len(threads)-1])
	bw := map[int]float64{}
	for _, n := range threads {
		bw[n] = tr.measure(n, cfg.reps)
	}
	tr = nil
	runtime.GC()
	debug.FreeOSMemory()

	type row struct {
		g     grid
		k     kernel
		n     int // goroutines asked for
		res   kernelResult
		mlup1 float64
	}
	var rows []row
	for _, g := range cfg.grids {
		for _, k := range pathKernels(cfg.paths) {
			var m1 float64
			for _, n := range threads {
				res, err := measureKernel(k, g, n, cfg.dur)
				if err != nil {
					return fmt.Errorf("%s %s threads=%d: %w", k.name, g, n, err)
				}
				if n == 1 {
					m1 = res.mlups
				}
				rows = append(rows, row{g: g, k: k, n: n, res: res, mlup1: m1})
			}
		}
	}

	fmt.Fprintln(w, "| grid | lattices | kernel | path | goroutines | MLUPS | triad GB/s | DRAM limit MLUPS | of limit | scaling |")
	fmt.Fprintln(w, "|---|---:|---|---|---:|---:|---:|---:|---:|---:|")
	for _, r := range rows {
		fits := ""
		if llc > 0 && r.k.latticeBytes(r.g) <= llc {
			fits = " *"
		}
		b := bw[r.n]
		limit := b / float64(r.k.bytes()) / 1e6
		scaling := "-"
		if r.n > 1 && r.mlup1 > 0 {
			scaling = fmt.Sprintf("%.0f%%", 100*r.res.mlups/(float64(r.res.threads)*r.mlup1))
		}
		fmt.Fprintf(w, "| %s | %s%s | %s | %s | %d | %.1f | %.1f | %.1f | %.0f%% | %s |\n",
			r.g, mib(r.k.latticeBytes(r.g)), fits, r.k.name, r.k.path, r.res.threads, r.res.mlups,
			b/1e9, limit, 100*r.res.mlups/limit, scaling)
	}
	fmt.Fprintln(w)
	fmt.Fprintf(w, "MLUPS: million node updates per second (Nz*Nr*steps/s), best batch.\n")
	fmt.Fprintf(w, "Triad: a[i] = b[i] + s*c[i], counted as 24 B/element (STREAM; write-allocate makes it 32 B), same goroutine count as the row.\n")
	fmt.Fprintf(w, "DRAM limit: triad bandwidth / %d B per node update (9 float64 reads + 9 writes; %d B with float32).\n", bytesPerUpdate, bytesPerUpdate/2)
	fmt.Fprintf(w, "Scaling: MLUPS(n) / (n * MLUPS(1)).\n")
	fmt.Fprintf(w, "lattices: size of the two population lattices; * = fits in the last-level cache,\n")
	fmt.Fprintf(w, "so that grid can run above the DRAM limit.\n")
	fmt.Fprintln(w)
	if err := driveTable(w, threads, cfg.paths, cfg.dur); err != nil {
		return err
	}
	fmt.Fprintf(w, "Total time %.1f s.\n", time.Since(start).Seconds())
	return nil
}

// pathKernels is every configuration of kernels on every path, grouped by
// configuration.
func pathKernels(paths []lbm.KernelPath) []kernel {
	var ks []kernel
	for _, k := range kernels {
		for _, p := range paths {
			ks = append(ks, k.on(p))
		}
	}
	return ks
}

// parseThreads reads a comma-separated list of goroutine counts; ""
// gives 1 and all cores (threadCounts).
func parseThreads(s string) ([]int, error) {
	if strings.TrimSpace(s) == "" {
		return threadCounts(), nil
	}
	var ns []int
	for _, f := range strings.Split(s, ",") {
		n, err := strconv.Atoi(strings.TrimSpace(f))
		if err != nil || n < 1 {
			return nil, fmt.Errorf("%q: want positive goroutine counts such as 1,2,4", f)
		}
		ns = append(ns, n)
	}
	return ns, nil
}

// mib formats a byte count in MiB.
func mib(b int) string {
	v := float64(b) / (1 << 20)
	if v >= 10 || v == math.Trunc(v) {
		return fmt.Sprintf("%.0f MiB", v)
	}
	return fmt.Sprintf("%.1f MiB", v)
}
