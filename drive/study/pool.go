package study

import (
	"context"
	"math"
	"sync"
)

// eachPoint calls do(i) for i = 0..n-1 on jobs goroutines, handing the
// points out in order, and returns when every call has returned. Once ctx
// is done no further point is handed out (the running ones stop at their
// own checkpoints).
func eachPoint(ctx context.Context, n, jobs int, do func(i int)) {
	next := make(chan int)
	var wg sync.WaitGroup
	for range max(1, min(jobs, n)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				do(i)
			}
		}()
	}
	for i := range n {
		if ctx.Err() != nil {
			break
		}
		next <- i
	}
	close(next)
	wg.Wait()
}

// nearest returns the candidate k (of cands) with the smallest dist(k),
// the lowest k among equals; -1 when cands is empty. It picks the source
// of a warm start: the finished run closest to the one about to start.
func nearest(cands []int, dist func(k int) float64) int {
	best, bestD := -1, math.Inf(1)
	for _, k := range cands {
		if d := dist(k); d < bestD || d == bestD && k < best {
			best, bestD = k, d
		}
	}
	return best
}
