package lbm

import (
	"runtime"
	"sync/atomic"
)

// pool is a persistent set of goroutines and a fixed cut of the rows into
// as many slabs. A parallel call hands every worker the same function;
// the goroutines (the caller among them) claim the slabs one by one, so
// that each slab is done once and a goroutine that has no core (more
// goroutines than GOMAXPROCS, or other processes on the cores) leaves its
// share to the others instead of holding up the pass. No goroutine is
// created per step. Which goroutine does a slab never changes a result:
// a slab's work depends on the slab alone (its index w picks its scratch).
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

	fn   func(lo, hi, w int) // the current pass, set before gen is raised
	gen  atomic.Uint64       // number of passes started
	left atomic.Int64        // slabs of the current pass not yet done
	// claim is the low 32 bits of the current pass's gen, shifted up 32,
	// plus the next slab to claim (see claimSlabs).
	claim  atomic.Uint64
	closed atomic.Bool
	parked []atomic.Bool // worker w is (about to be) parked on wake[w]

	// missRate is the recent fraction (times spinScale) of full spins that
	// ended parked, waits counts the waits for the probes (see spinWait).
	// Updates may race and be lost: they only steer the spinning.
	missRate atomic.Int64
	waits    atomic.Uint64
	wake     []chan struct{} // a token wakes a parked worker

	// crowded: the pool has more goroutines than GOMAXPROCS (read at
	// every pass), so a spinning goroutine holds a P that a working one
	// needs; the waits then yield (runtime.Gosched) instead of pausing.
	crowded atomic.Bool

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
// between two passes of a step.
//
// Spinning pays only while every goroutine of the pool has a core. When
// other processes share the cores (go test runs packages side by side;
// concurrent runs), a worker is often descheduled, its partners' spins
// fail, and spinning only takes cores from the thread being waited for.
// Measured on 2 cores with the small test swimmer on two goroutines:
// unloaded, 0.3% of the waits outlast the spin; beside two busy processes,
// 47% do, and the run took 5.2 times as long as unloaded (1.9 times with
// no spin at all). So the pool keeps the rate at which full spins fail
// (missRate, an average over about 32 of them) and while it is above
// spinMissHigh spins only spinMin polls, probing with a full spin one
// wait in spinProbe to notice when the cores are free again. With this
// back-off the loaded run took 2.5-3.3 times as long as unloaded, and the
// unloaded one was as fast as with a fixed spin; go test ./... went from
// 6.5 to 1.6 minutes on 2 cores. (Which goroutine waits how long never
// changes a result: only the timing.)
const (
	spinWait     = 1 << 11
	spinMin      = 16
	spinProbe    = 64
	spinScale    = 1 << 20        // missRate's fixed point
	spinMissHigh = spinScale / 10 // 10% of full spins failing
)

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

// work is worker w's loop: wait for the next pass, claim and run slabs of
// it, report each.
func (p *pool) work(w int) {
	var seen uint64
	for {
		g := p.gen.Load()
		limit, full := p.spinLimit()
		for spin := 0; g == seen && spin < limit; spin++ {
			p.relax()
			g = p.gen.Load()
		}
		if full {
			p.spun(g == seen)
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
		p.claimSlabs(g)
	}
}

// claimSlabs claims the slabs of pass g one at a time and runs them until
// none is left. A goroutine that comes late to a pass (or to a pass that
// is already over) finds nothing to claim.
func (p *pool) claimSlabs(g uint64) {
	n := uint64(len(p.slabs))
	tag := (g & 0xffffffff) << 32
	for {
		c := p.claim.Load()
		if c&^0xffffffff != tag || c&0xffffffff >= n {
			return
		}
		if !p.claim.CompareAndSwap(c, c+1) {
			continue
		}
		w := int(c & 0xffffffff)
		p.fn(p.slabs[w][0], p.slabs[w][1], w)
		if p.left.Add(-1) == 0 && p.callerParked.Load() {
			select {
			case p.finished <- struct{}{}:
			default:
			}
		}
	}
}

// run calls fn on every slab in parallel (the calling goroutine claims
// slabs too) and waits for all of them.
func (p *pool) run(fn func(lo, hi, w int)) {
	n := len(p.slabs)
	if n == 1 {
		fn(p.slabs[0][0], p.slabs[0][1], 0)
		return
	}
	p.fn = fn
	p.crowded.Store(n > runtime.GOMAXPROCS(0))
	p.left.Store(int64(n))
	// The claims of the new pass are open before any worker can see it.
	g := p.gen.Load() + 1
	p.claim.Store((g & 0xffffffff) << 32)
	p.gen.Store(g)
	p.wakeParked()
	p.claimSlabs(g)
	limit, full := p.spinLimit()
	for spin := 0; p.left.Load() != 0 && spin < limit; spin++ {
		p.relax()
	}
	if full {
		p.spun(p.left.Load() != 0)
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

// relax is one poll's pause of a spinning wait: PAUSE, or when the pool is
// crowded (more goroutines than GOMAXPROCS) a yield of the P to a
// goroutine that has work. Measured on 2 cores with GOMAXPROCS=2 (AVX2
// path), the demo with -threads 3 and 4 took 1.2-1.5 and 1.2-1.4 times as
// long per period as with 2 goroutines when each goroutine ran its own
// slab and the waits paused; with the claimed slabs and the yield, 1.0-1.2
// and 0.9-1.05 (benchmarks/README.md).
func (p *pool) relax() {
	if p.crowded.Load() {
		runtime.Gosched()
		return
	}
	cpuRelax()
}

// spinLimit returns how long the next wait spins, and whether that is a
// full spin (whose outcome counts in missRate).
func (p *pool) spinLimit() (int, bool) {
	if p.missRate.Load() < spinMissHigh || p.waits.Add(1)%spinProbe == 0 {
		return spinWait, true
	}
	return spinMin, false
}

// spun records whether a full spin failed (the wait went on to park).
func (p *pool) spun(missed bool) {
	r := p.missRate.Load()
	r -= r / 32
	if missed {
		r += spinScale / 32
	}
	p.missRate.Store(r)
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
