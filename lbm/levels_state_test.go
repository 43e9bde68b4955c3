package lbm

import (
	"math"
	"testing"
)

// levelsRun makes three levels (axisymmetric, closed ends, an oscillating
// body force), runs n steps with a move of the refined levels halfway, and
// returns them. No solid nodes: without a body's links, which rewrite the
// slots of a solid node that fluid nodes read, those slots keep values of
// the other buffer of the step pair, which no snapshot holds (the solid
// nodes' move is TestLevelsMoveRefuses's).
func levelsRun(t *testing.T, threads int, single bool, n int) *Levels {
	t.Helper()
	h, err := NewLevels(Config{Nz: 24, Nr: 8, Tau: 0.55, Axisymmetric: true, Threads: threads, Single: single},
		[]Block{{Z0: 6, R0: 0, Nz: 8, Nr: 4}, {Z0: 2, R0: 0, Nz: 12, Nr: 4}})
	if err != nil {
		t.Fatal(err)
	}
	h.SetForceFunc(func(t float64) (float64, float64) { return 1e-5 * math.Cos(0.05*t), 0 })
	for s := 0; s < n; s++ {
		if s == n/2 {
			if err := h.MoveAll(1); err != nil {
				t.Fatal(err)
			}
		}
		h.Step()
	}
	return h
}

// sameBits fails unless every level of a and b holds the same bits.
func sameBits(t *testing.T, what string, a, b *Levels) {
	t.Helper()
	for l := 0; l < a.Len(); l++ {
		sa, sb := a.Level(l).State(), b.Level(l).State()
		for i := 0; i < Q; i++ {
			for n := range sa[i] {
				if math.Float64bits(sa[i][n]) != math.Float64bits(sb[i][n]) {
					t.Fatalf("%s: level %d population %d node %d: %v and %v", what, l, i, n, sa[i][n], sb[i][n])
				}
			}
		}
	}
}

// TestLevelsSameBits: levels moved during the run give the same bits for
// 1, 2 and 4 goroutines (the project's rule), in float64 and float32
// storage.
func TestLevelsSameBits(t *testing.T) {
	for _, single := range []bool{false, true} {
		ref := levelsRun(t, 1, single, 120)
		for _, th := range []int{2, 4} {
			h := levelsRun(t, th, single, 120)
			sameBits(t, "goroutines", ref, h)
			h.Close()
		}
		ref.Close()
	}
}

// TestLevelsRestore: a snapshot taken after a move, restored into fresh
// levels, continues with the same bits as the levels it was taken from
// (checkpoints resume bit for bit).
func TestLevelsRestore(t *testing.T) {
	a := levelsRun(t, 2, false, 80) // moved at step 40
	defer a.Close()
	st := a.Snapshot()
	b, err := NewLevels(Config{Nz: 24, Nr: 8, Tau: 0.55, Axisymmetric: true, Threads: 1},
		[]Block{{Z0: 6, R0: 0, Nz: 8, Nr: 4}, {Z0: 2, R0: 0, Nz: 12, Nr: 4}})
	if err != nil {
		t.Fatal(err)
	}
	defer b.Close()
	if err := b.Restore(st); err != nil {
		t.Fatal(err)
	}
	if b.Block(1) != a.Block(1) {
		t.Fatalf("restored level 1 at %+v, want %+v", b.Block(1), a.Block(1))
	}
	b.SetForceFunc(func(t float64) (float64, float64) { return 1e-5 * math.Cos(0.05*t), 0 })
	for s := 0; s < 60; s++ {
		a.Step()
		b.Step()
	}
	sameBits(t, "restored", a, b)
	st.Levels = st.Levels[:2]
	if err := b.Restore(st); err == nil {
		t.Error("a state of 2 levels restored into 3")
	}
}

// TestLevelsRestoreFields: a fine level's fields right after a restore,
// before any step, are bit for bit those of the levels the state was taken
// from (the saved ring the ghosts extrapolate from is part of the state).
func TestLevelsRestoreFields(t *testing.T) {
	a := levelsRun(t, 1, false, 30)
	defer a.Close()
	b, err := NewLevels(Config{Nz: 24, Nr: 8, Tau: 0.55, Axisymmetric: true, Threads: 1},
		[]Block{{Z0: 6, R0: 0, Nz: 8, Nr: 4}, {Z0: 2, R0: 0, Nz: 12, Nr: 4}})
	if err != nil {
		t.Fatal(err)
	}
	defer b.Close()
	if err := b.Restore(a.Snapshot()); err != nil {
		t.Fatal(err)
	}
	for l := 1; l < 3; l++ {
		fa, fb := a.Fields(l, nil), b.Fields(l, nil)
		for n := range fa.Uz {
			if math.Float64bits(fa.Uz[n]) != math.Float64bits(fb.Uz[n]) || math.Float64bits(fa.Rho[n]) != math.Float64bits(fb.Rho[n]) {
				t.Fatalf("level %d node %d: u_z %v and %v after the restore", l, n, fa.Uz[n], fb.Uz[n])
			}
		}
	}
}
