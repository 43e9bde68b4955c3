package lbm

import "sync/atomic"

// pool is a persistent set of goroutines, each owning a fixed slab of rows.
// A parallel call hands every worker the same function and its slab; no
// goroutine is created per step.
//
// A step of a small lattice takes a few hundred microseconds, and the
// serial work between two parallel passes (boundary links, bodies) tens of
// them: waking a parked goroutine through the scheduler costs about as
// much, which made two goroutines slower than one on the demo. So the
// workers spin on the pass counter for a while (spinWait) before they park,
// and the caller spins on the count of running workers; a worker parks only
// when no pass has come for that long.
type pool struct {
	slabs [][2]int // rows [lo, hi) of each worker

	fn     func(lo, hi, w int) // the current pass, set before gen is raised
	gen    atomic.Uint64       // number of passes started
	left   atomic.Int64        // workers still running the current pass
	closed atomic.Bool
	parked []atomic.Bool   // worker w is (about to be) parked on wake[w]
	wake   []chan struct{} // a token wakes a parked worker

	callerParked atomic.Bool   // the caller of run is (about to be) parked on finished
	finished     chan struct{} // a token wakes it

	// cur is the pass that runTask is running and runCur the function,
	// made once, that hands it to the workers.
	cur    task
	runCur func(lo, hi, w int)
}

// spinWait is how many times a worker polls the pass counter, or the
// caller the count of running workers, (with cpuRelax between polls) before
// it parks: about a hundred microseconds, longer than the serial work
// between two passes of a step, short enough that other processes on the
// same cores (tests, the points of a sweep) get them back soon.
const spinWait = 1 << 11

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

	user func(w, workers int) // for Solver.Parallel
}

// userTask runs a Solver.Parallel function on worker w.
func userTask(t *task, _, _, w int) { t.user(w, len(t.s.pool.slabs)) }

func newPool(rows, n int) *pool {
	p := &pool{}
	for w := 0; w < n; w++ {
		lo := rows * w / n
		hi := rows * (w + 1) / n
		p.slabs = append(p.slabs, [2]int{lo, hi})
	}
	p.parked = make([]atomic.Bool, n)
	p.finished = make(chan struct{}, 1)
	p.wake = make([]chan struct{}, n)
	p.runCur = func(lo, hi, w int) { p.cur.fn(&p.cur, lo, hi, w) }
	for w := 1; w < n; w++ {
		p.wake[w] = make(chan struct{}, 1)
		go p.work(w)
	}
	return p
}

// work is worker w's loop: wait for the next pass, run it on the slab,
// report.
func (p *pool) work(w int) {
	lo, hi := p.slabs[w][0], p.slabs[w][1]
	var seen uint64
	for {
		g := p.gen.Load()
		for spin := 0; g == seen && spin < spinWait; spin++ {
			cpuRelax()
			g = p.gen.Load()
		}
		for g == seen {
			// Park. The counter is read again after the flag is set, so a
			// pass started in between is not missed: either this read sees
			// it, or run sees the flag and sends a token. A token left over
			// from an earlier wake-up only makes the loop look again.
			p.parked[w].Store(true)
			if g = p.gen.Load(); g == seen {
				<-p.wake[w]
				g = p.gen.Load()
			}
			p.parked[w].Store(false)
		}
		seen = g
		if p.closed.Load() {
			return
		}
		p.fn(lo, hi, w)
		if p.left.Add(-1) == 0 && p.callerParked.Load() {
			select {
			case p.finished <- struct{}{}:
			default:
			}
		}
	}
}

// run calls fn on every slab in parallel (slab 0 on the calling goroutine)
// and waits for all of them.
func (p *pool) run(fn func(lo, hi, w int)) {
	n := len(p.slabs)
	if n == 1 {
		fn(p.slabs[0][0], p.slabs[0][1], 0)
		return
	}
	p.fn = fn
	p.left.Store(int64(n - 1))
	p.gen.Add(1)
	p.wakeParked()
	fn(p.slabs[0][0], p.slabs[0][1], 0)
	for spin := 0; p.left.Load() != 0 && spin < spinWait; spin++ {
		cpuRelax()
	}
	for p.left.Load() != 0 {
		// Park until the last worker is done, as the workers park (see
		// work): the flag is set before left is read again, and the last
		// worker reads the flag after it brought left to zero.
		p.callerParked.Store(true)
		if p.left.Load() != 0 {
			<-p.finished
		}
		p.callerParked.Store(false)
	}
	p.fn = nil
}

// wakeParked sends a token to every parked worker.
func (p *pool) wakeParked() {
	for w := 1; w < len(p.slabs); w++ {
		if p.parked[w].Load() {
			select {
			case p.wake[w] <- struct{}{}:
			default: // a token is already waiting
			}
		}
	}
}

// runTask runs t on every slab in parallel, like run, without allocating.
func (p *pool) runTask(t task) {
	p.cur = t
	p.run(p.runCur)
	p.cur = task{}
}

// close stops the workers.
func (p *pool) close() {
	p.closed.Store(true)
	p.gen.Add(1)
	p.wakeParked()
}
