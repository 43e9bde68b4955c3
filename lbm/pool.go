package lbm

import "sync"

// pool is a persistent set of goroutines, each owning a fixed slab of rows.
// A parallel call hands every worker the same function and its slab; no
// goroutine is created per step.
type pool struct {
	slabs [][2]int // rows [lo, hi) of each worker
	start []chan func(lo, hi, w int)
	done  sync.WaitGroup

	// cur is the pass that runTask is running and runCur the function,
	// made once, that hands it to the workers.
	cur    task
	runCur func(lo, hi, w int)
}

// task is a parallel pass given as a plain function and its arguments
// rather than as a closure: a closure handed to the workers escapes to the
// heap, so making one for every pass would allocate, while a task is
// copied into the pool and its function is a static one. fn does rows
// [lo, hi) of worker w; a reduction stores each row's value in
// s.rowSum[j].
type task struct {
	s  *Solver
	f  *Fields
	x  float64
	on bool // a switch for fn
	fn func(t *task, lo, hi, w int)
}

func newPool(rows, n int) *pool {
	p := &pool{}
	for w := 0; w < n; w++ {
		lo := rows * w / n
		hi := rows * (w + 1) / n
		p.slabs = append(p.slabs, [2]int{lo, hi})
	}
	p.start = make([]chan func(lo, hi, w int), n)
	p.runCur = func(lo, hi, w int) { p.cur.fn(&p.cur, lo, hi, w) }
	for w := 1; w < n; w++ {
		ch := make(chan func(lo, hi, w int))
		p.start[w] = ch
		go func(w int) {
			for fn := range ch {
				fn(p.slabs[w][0], p.slabs[w][1], w)
				p.done.Done()
			}
		}(w)
	}
	return p
}

// run calls fn on every slab in parallel (slab 0 on the calling goroutine)
// and waits for all of them.
func (p *pool) run(fn func(lo, hi, w int)) {
	n := len(p.slabs)
	p.done.Add(n - 1)
	for w := 1; w < n; w++ {
		p.start[w] <- fn
	}
	fn(p.slabs[0][0], p.slabs[0][1], 0)
	p.done.Wait()
}

// runTask runs t on every slab in parallel, like run, without allocating.
func (p *pool) runTask(t task) {
	p.cur = t
	p.run(p.runCur)
	p.cur = task{}
}

func (p *pool) close() {
	for w := 1; w < len(p.start); w++ {
		close(p.start[w])
	}
}
