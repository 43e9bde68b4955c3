package lbm

import (
	"fmt"
	"runtime"
)

// Config describes a lattice: its size, its physics and its boundaries.
type Config struct {
	Nz, Nr int // nodes along z and r

	// Tau is the relaxation time of the even moments (shear viscosity
	// nu = (Tau - 1/2)/3 in lattice units).
	Tau float64
	// Collision selects TRT (default), MRT or BGK.
	Collision Collision
	// Magic is the TRT/MRT magic parameter Lambda = (tau+ - 1/2)(tau- - 1/2);
	// 0 means 3/16, for which halfway bounce-back puts a flat wall exactly
	// midway between nodes at any viscosity (Ginzburg, Verhaeghe &
	// d'Humieres 2008). Ignored by BGK.
	Magic float64
	// EpsilonRate is the MRT relaxation rate of the energy-square moment;
	// 0 means 1.2 (METHODS.md 2.4 recommends a value in [1, 1.5]).
	EpsilonRate float64

	// Axisymmetric adds the axisymmetric source terms; without it the
	// lattice is a planar (z, y) channel with a mirror line at y = 0.
	Axisymmetric bool
	// PeriodicZ makes the ends periodic; otherwise they are no-slip walls.
	PeriodicZ bool

	// Open lists the sides that are interfaces to another lattice rather
	// than boundaries: the lattice leaves their ghost values alone, and
	// the caller (a Levels coupling) writes them before each Step. An open
	// side replaces that side's axis, wall, end or periodic copy.
	Open Sides
	// RowOffset is the number of this lattice's rows between the axis and
	// its row 0: row j lies at r = RowOffset + j + 1/2. A lattice with a
	// positive RowOffset does not touch the axis, so its r-min side must be
	// open.
	RowOffset int

	// Threads is the number of goroutines (0: GOMAXPROCS).
	Threads int

	// Kernel chooses the path of the block loops: KernelPortable (Go),
	// KernelAVX2 or KernelAVX512 (amd64 assembly). All give the same bits;
	// the SIMD ones are faster. KernelAuto (the zero value) takes the path
	// named by the environment variable AXISWIM_KERNEL, else the fastest
	// the processor has. New fails on a path the processor or build cannot
	// run.
	Kernel KernelPath

	// Single stores the populations (their deviations f_i - w_i from the
	// weights) in float32 instead of float64; every operation is still done
	// in float64, and values are rounded to float32 only when stored. It
	// halves the memory and the memory traffic of a step. Results differ
	// from float64 storage by the float32 rounding of the deviations.
	Single bool
}

func (c *Config) check() error {
	if c.Nz < 1 || c.Nr < 1 {
		return fmt.Errorf("lbm: grid %dx%d: both sizes must be at least 1", c.Nz, c.Nr)
	}
	if !(c.Tau > 0.5) {
		return fmt.Errorf("lbm: tau = %g: must exceed 1/2 (the viscosity (tau-1/2)/3 must be positive)", c.Tau)
	}
	if c.Magic < 0 {
		return fmt.Errorf("lbm: magic parameter %g: must be positive", c.Magic)
	}
	if c.Threads < 0 {
		return fmt.Errorf("lbm: %d threads: must be 0 (all) or positive", c.Threads)
	}
	if c.RowOffset < 0 {
		return fmt.Errorf("lbm: row offset %d: must be zero or positive", c.RowOffset)
	}
	if c.RowOffset > 0 && c.Open&SideAxis == 0 {
		return fmt.Errorf("lbm: row offset %d: a lattice away from the axis needs its r-min side open", c.RowOffset)
	}
	if c.PeriodicZ && c.Open&(SideZMin|SideZMax) != 0 {
		return fmt.Errorf("lbm: periodic ends cannot also be open")
	}
	switch c.Collision {
	case TRT, MRT, BGK:
	default:
		return fmt.Errorf("lbm: unknown collision operator %d", c.Collision)
	}
	return nil
}

func (c *Config) threads() int {
	n := c.Threads
	if n == 0 {
		n = runtime.GOMAXPROCS(0)
	}
	if n > c.Nr {
		n = c.Nr
	}
	return n
}

// Viscosity returns the lattice kinematic viscosity (Tau - 1/2)/3.
func (c *Config) Viscosity() float64 { return Cs2 * (c.Tau - 0.5) }

// rates returns the even and odd relaxation rates.
func (c *Config) rates() (wp, wm float64) {
	wp = 1 / c.Tau
	if c.Collision == BGK {
		return wp, wp
	}
	lam := c.Magic
	if lam == 0 {
		lam = 3.0 / 16
	}
	// Lambda = (1/w+ - 1/2)(1/w- - 1/2)
	wm = 1 / (0.5 + lam/(c.Tau-0.5))
	return wp, wm
}

// Sides is a set of the four sides of a lattice.
type Sides uint8

// The sides of a lattice: its ends at z-min and z-max, its r-min side (the
// axis, for a lattice that touches it) and its r-max side (the wall).
const (
	SideZMin Sides = 1 << iota
	SideZMax
	SideAxis
	SideWall
)
