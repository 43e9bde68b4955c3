package main

import (
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"time"
)

// triadBytesPerElem is the traffic counted per triad element, STREAM's
// convention: read b[i] and c[i], write a[i], 3 x 8 bytes. With
// write-allocate caches the line of a[i] is also read before it is written,
// so the real DRAM traffic is 32 bytes per element; like STREAM we report
// the 24-byte figure.
const triadBytesPerElem = 3 * 8

// defaultTriadMiB is the default size of each of the three triad arrays,
// 3 x 512 MiB = 1.5 GiB in all; it must be at least four times the
// last-level cache (STREAM's rule) for the triad to measure DRAM.
const defaultTriadMiB = 512

// triadScalar is the s of a[i] = b[i] + s*c[i].
const triadScalar = 3.0

// triad holds the three arrays of the STREAM triad.
type triad struct {
	a, b, c []float64
}

// newTriad allocates three arrays of n float64 and sets b = 1, c = 2, a = 0,
// touching the pages with the given number of goroutines (first touch).
func newTriad(n, threads int) *triad {
	t := &triad{a: make([]float64, n), b: make([]float64, n), c: make([]float64, n)}
	parallel(n, threads, func(lo, hi int) {
		a, b, c := t.a[lo:hi], t.b[lo:hi], t.c[lo:hi]
		for i := range a {
			a[i], b[i], c[i] = 0, 1, 2
		}
	})
	return t
}

// bytes is the traffic of one triad pass, counted at 24 bytes per element.
func (t *triad) bytes() int { return triadBytesPerElem * len(t.a) }

// run does one pass a[i] = b[i] + s*c[i] split over the given number of
// goroutines.
func (t *triad) run(threads int) {
	parallel(len(t.a), threads, func(lo, hi int) {
		triadRange(t.a[lo:hi], t.b[lo:hi], t.c[lo:hi], triadScalar)
	})
}

// triadRange is the triad loop on one chunk, unrolled by four.
func triadRange(a, b, c []float64, s float64) {
	n := len(a)
	b, c = b[:n], c[:n]
	i := 0
	for ; i+4 <= n; i += 4 {
		a[i] = b[i] + s*c[i]
		a[i+1] = b[i+1] + s*c[i+1]
		a[i+2] = b[i+2] + s*c[i+2]
		a[i+3] = b[i+3] + s*c[i+3]
	}
	for ; i < n; i++ {
		a[i] = b[i] + s*c[i]
	}
}

// measure runs reps passes with the given number of goroutines and returns
// the best bandwidth in bytes per second (24 bytes per element).
func (t *triad) measure(threads, reps int) float64 {
	t.run(threads) // warm-up pass
	best := 0.0
	for range max(reps, 1) {
		t0 := time.Now()
		t.run(threads)
		d := max(time.Since(t0), time.Nanosecond)
		best = max(best, float64(t.bytes())/d.Seconds())
	}
	return best
}

// parallel calls fn on threads contiguous chunks of [0, n), each aligned to
// eight elements (one 64-byte cache line), and waits for them. Chunk 0 runs
// on the calling goroutine.
func parallel(n, threads int, fn func(lo, hi int)) {
	threads = max(1, min(threads, n))
	if threads == 1 {
		fn(0, n)
		return
	}
	bound := func(w int) int {
		if w == threads {
			return n
		}
		return n * w / threads &^ 7
	}
	var wg sync.WaitGroup
	for w := 1; w < threads; w++ {
		wg.Go(func() { fn(bound(w), bound(w+1)) })
	}
	fn(0, bound(1))
	wg.Wait()
}

// lastLevelCache returns the total size in bytes of the last-level caches
// of the machine, summed over the distinct cache instances, from
// /sys/devices/system/cpu/cpu*/cache/index*; 0 if they cannot be read.
func lastLevelCache() int {
	dirs, _ := filepath.Glob("/sys/devices/system/cpu/cpu[0-9]*/cache/index[0-9]*")
	read := func(dir, name string) string {
		b, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			return ""
		}
		return strings.TrimSpace(string(b))
	}
	level := 0
	sizes := map[string]int{} // shared_cpu_list -> size, per last level
	for _, d := range dirs {
		if read(d, "type") == "Instruction" {
			continue
		}
		l, err := strconv.Atoi(read(d, "level"))
		if err != nil || l < level {
			continue
		}
		size := parseCacheSize(read(d, "size"))
		if size == 0 {
			continue
		}
		if l > level {
			level = l
			sizes = map[string]int{}
		}
		sizes[read(d, "shared_cpu_list")+"/"+read(d, "id")] = size
	}
	total := 0
	for _, s := range sizes {
		total += s
	}
	return total
}

// parseCacheSize reads sizes such as "32768K", "1M" or "512".
func parseCacheSize(s string) int {
	mult := 1
	switch {
	case strings.HasSuffix(s, "K"):
		mult, s = 1<<10, strings.TrimSuffix(s, "K")
	case strings.HasSuffix(s, "M"):
		mult, s = 1<<20, strings.TrimSuffix(s, "M")
	case strings.HasSuffix(s, "G"):
		mult, s = 1<<30, strings.TrimSuffix(s, "G")
	}
	v, err := strconv.Atoi(s)
	if err != nil || v < 0 {
		return 0
	}
	return v * mult
}
