package lbm

import (
	"fmt"
	"time"
	"unsafe"
)

// Solver is a D2Q9 lattice with its populations, boundaries and worker pool.
// Use New to make one and Close to release its goroutines.
type Solver struct {
	cfg    Config
	nz, nr int
	w      int          // row stride including the halo: nz + 2
	a, b   [Q][]float64 // populations (deviations f - w); nil with Single
	a32    [Q][]float32 // with Single: the populations in float32
	b32    [Q][]float32
	single bool   // float32 storage
	off    [Q]int // index offset of the upstream node: e_z + e_r*w

	solid []bool        // per node including halo; halo nodes are not solid
	segs  [][][2]int    // per row: fluid runs [k0, k1)
	rows  []rowConst    // per-row constants of the axisymmetric terms
	nIter int           // fixed-point iterations of the half-step moments
	wp    float64       // even relaxation rate
	wm    float64       // odd relaxation rate
	mrt   *mrtRates     // nil unless MRT
	nu    float64       // lattice kinematic viscosity
	gz    float64       // uniform body force density, z
	gr    float64       // uniform body force density, r
	steps int64         // steps taken
	kernT time.Duration // wall time spent in the fused kernel
	path  KernelPath    // the path of the block loops (see KernelPath)
	// haloStale: the lattice changed since the kernel wrote the end ghosts
	// (see fillHalo)
	haloStale bool
	blocks    []*block // the kernel's scratch block of each worker
	pool      *pool
	rowSum    []float64 // per-row partial sums for deterministic reductions
	kernel    func(lo, hi, w int)
	bodies    []*Boundary // moving bodies, by id
}

// rowConst holds what the axisymmetric terms need of a row: 1/r and
// nu/r^2 (both zero for a planar lattice).
type rowConst struct {
	r, invR, nuInvR2 float64
}

// New makes a lattice at rest (all deviations zero).
func New(cfg Config) (*Solver, error) {
	if err := cfg.check(); err != nil {
		return nil, err
	}
	path, err := ResolveKernel(cfg.Kernel)
	if err != nil {
		return nil, err
	}
	s := &Solver{cfg: cfg, nz: cfg.Nz, nr: cfg.Nr, w: cfg.Nz + 2}
	size := (cfg.Nz + 2) * (cfg.Nr + 2)
	s.single = cfg.Single
	if s.single {
		s.a32 = planes[float32](size, 0)
		s.b32 = planes[float32](size, planePad) // planePad float32s: half the stagger in bytes
	} else {
		s.a = planes[float64](size, 0)
		s.b = planes[float64](size, planePad/2)
	}
	for i := 0; i < Q; i++ {
		s.off[i] = Ez[i] + Er[i]*s.w
	}
	s.solid = make([]bool, size)
	s.segs = make([][][2]int, cfg.Nr)
	for j := range s.segs {
		s.segs[j] = [][2]int{{0, cfg.Nz}}
	}
	s.nu = cfg.Viscosity()
	s.wp, s.wm = cfg.rates()
	if cfg.Collision == MRT {
		s.mrt = newMRTRates(cfg)
	}
	s.rows = make([]rowConst, cfg.Nr)
	for j := range s.rows {
		r := float64(cfg.RowOffset+j) + 0.5
		s.rows[j].r = r
		if cfg.Axisymmetric {
			s.rows[j].invR = 1 / r
			s.rows[j].nuInvR2 = s.nu / (r * r)
		}
	}
	s.nIter = 1
	if cfg.Axisymmetric {
		// METHODS.md 3.4 Step A: 2-3 fixed-point passes; the third changes
		// the moments by far less than the truncation error.
		s.nIter = 3
	}
	s.rowSum = make([]float64, cfg.Nr)
	s.pool = newPool(cfg.Nr, cfg.threads())
	s.kernel = s.streamCollideRows
	s.path = path
	s.haloStale = true
	s.blocks = make([]*block, s.Threads())
	for w := range s.blocks {
		s.blocks[w] = newBlock()
	}
	return s, nil
}

// Close stops the worker goroutines. The solver must not be used afterwards.
func (s *Solver) Close() { s.pool.close() }

// Config returns the configuration the solver was made with.
func (s *Solver) Config() Config { return s.cfg }

// Size returns the number of nodes along z and r.
func (s *Solver) Size() (nz, nr int) { return s.nz, s.nr }

// Kernel names the path of the block loops the steps run: KernelAVX512,
// KernelAVX2 or KernelPortable, never KernelAuto.
func (s *Solver) Kernel() KernelPath { return s.path }

// Parallel calls fn(w, workers) once on each of the solver's worker
// goroutines, w = 0 .. workers-1 (w = 0 on the caller's), and waits for all
// of them: the same goroutines that run the steps, so that work between
// steps (the bodies' boundary links, say) can be shared without starting
// any. It does not allocate when fn is made once and kept (a method
// value stored by the caller). It must not be called during a Step or from
// fn.
func (s *Solver) Parallel(fn func(w, workers int)) {
	s.pool.runTask(task{s: s, user: fn, fn: userTask})
}

// Threads returns the number of goroutines working on each step.
func (s *Solver) Threads() int { return len(s.pool.slabs) }

// Steps returns the number of time steps taken.
func (s *Solver) Steps() int64 { return s.steps }

// KernelTime returns the wall time the steps so far spent in the fused
// stream-and-collide kernel (the parallel sweep over the fluid nodes), as
// opposed to the halo, boundary links and everything outside Step. It lets
// callers measure the share of a step spent outside the kernel.
func (s *Solver) KernelTime() time.Duration { return s.kernT }

// Viscosity returns the lattice kinematic viscosity.
func (s *Solver) Viscosity() float64 { return s.nu }

// SetForce sets the uniform body-force density (lattice units) applied at
// the collision of the next step, that is at time Steps().
func (s *Solver) SetForce(gz, gr float64) { s.gz, s.gr = gz, gr }

// idx is the storage index of node (k, j); k and j may be -1 or Nz, Nr
// (the halo).
func (s *Solver) idx(k, j int) int { return (j+1)*s.w + k + 1 }

// Step advances the lattice by one time step: it completes the streaming of
// the previous post-collision state (walls, axis, ends) and collides.
func (s *Solver) Step() {
	s.fillHalo()
	s.boundaryPass(true)
	t0 := time.Now()
	s.pool.run(s.kernel)
	s.kernT += time.Since(t0)
	s.a, s.b = s.b, s.a
	s.a32, s.b32 = s.b32, s.a32
	s.steps++
}

// String describes the lattice briefly.
func (s *Solver) String() string {
	kind := "planar"
	if s.cfg.Axisymmetric {
		kind = "axisymmetric"
	}
	ends := "closed"
	if s.cfg.PeriodicZ {
		ends = "periodic"
	}
	prec := "float64"
	if s.single {
		prec = "float32"
	}
	return fmt.Sprintf("%s D2Q9 %dx%d, %s, tau=%.5g, %s ends, %s storage, %s kernel, %d goroutines",
		kind, s.nz, s.nr, s.cfg.Collision, s.cfg.Tau, ends, prec, s.Kernel(), s.Threads())
}

// planePad is the stagger between consecutive planes, in float64s (384
// bytes, six cache lines). Without it, planes whose size is close to a
// multiple of 4 KiB start at nearly the same address modulo 4 KiB, and the
// 18 streams of the kernel then compete for the same L1 sets and alias in
// the store buffer (4K aliasing); the shared/yardstick kernel pads the same
// way.
const planePad = 48

// planes cuts nine planes of size values from one allocation, each starting
// planePad float64s (384 bytes) later modulo 4 KiB than the one before,
// shifted by shift values.
func planes[T real](size, shift int) [Q][]T {
	pad := planePad * 8 / int(unsafe.Sizeof(T(0)))
	stride := (size+511)/512*512 + pad
	back := make([]T, Q*stride+shift)
	adviseHuge(back)
	var p [Q][]T
	for i := range p {
		o := shift + i*stride
		p[i] = back[o : o+size : o+size]
	}
	return p
}
