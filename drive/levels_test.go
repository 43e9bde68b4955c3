package drive

import (
	"math"
	"slices"
	"testing"

	"axiswim/cases"
)

// settlingOnLevels is the small test swimmer on two levels, settling under
// gravity so that the refined levels follow it.
func settlingOnLevels(t *testing.T, precision string) (*cases.Case, *cases.Lattice) {
	t.Helper()
	c, err := cases.Load("../testdata/small-swimmer.toml")
	if err != nil {
		t.Fatal(err)
	}
	// a fine margin of 1.5 radii (9 cells): the levels move within the
	// first period
	c.Grid.Levels, c.Grid.CellsPerRadius, c.Shaking.Gravity, c.Grid.FineMargin = 2, 6, 3, 1.5
	c.Solver.Precision = precision
	l, err := cases.Resolve(c)
	if err != nil {
		t.Fatal(err)
	}
	return c, l
}

// TestLevelsSameBits: a run on refined levels, moves of the levels
// included, gives the same bits on 1, 2 and 4 goroutines, in float64 and
// float32 storage: the spheres' positions and every level's populations.
func TestLevelsSameBits(t *testing.T) {
	for _, prec := range []string{cases.PrecisionDouble, cases.PrecisionSingle} {
		c, l := settlingOnLevels(t, prec)
		var ref State
		var refMoves int
		for _, threads := range []int{1, 2, 4} {
			s, err := New(c, l, threads)
			if err != nil {
				t.Fatal(err)
			}
			// two periods: the levels have moved by then
			if err := s.Advance(2 * l.StepsPerPeriod); err != nil {
				t.Fatal(err)
			}
			st := s.Capture()
			moves, _ := s.LevelMoves()
			s.Close()
			if threads == 1 {
				ref, refMoves = st, moves
				if moves == 0 {
					t.Fatalf("%s: the levels did not move; the test needs a move", prec)
				}
				continue
			}
			if moves != refMoves {
				t.Errorf("%s, %d goroutines: %d moves, 1 goroutine %d", prec, threads, moves, refMoves)
			}
			for k := range st.Bodies {
				if st.Bodies[k].Z != ref.Bodies[k].Z || st.Bodies[k].V != ref.Bodies[k].V {
					t.Errorf("%s, %d goroutines: sphere %d at %v moving %v, 1 goroutine %v, %v", prec, threads, k+1,
						st.Bodies[k].Z, st.Bodies[k].V, ref.Bodies[k].Z, ref.Bodies[k].V)
				}
			}
			for lev := range st.Levels.Levels {
				for i := range st.Levels.Levels[lev].Pops {
					a, b := st.Levels.Levels[lev].Pops[i], ref.Levels.Levels[lev].Pops[i]
					if !slices.EqualFunc(a, b, func(x, y float64) bool { return math.Float64bits(x) == math.Float64bits(y) }) {
						t.Errorf("%s, %d goroutines: level %d population %d differs from 1 goroutine's", prec, threads, lev, i)
					}
				}
			}
		}
	}
}

// TestLevelsFollow: a settling swimmer keeps its fine margin: after every
// step of level 0 its surfaces lie at least cases.MinFineMarginCells inside
// the finest level (follow moves the levels before that; with a margin of
// 1.5 radii, 9 cells, the region is too small to keep the margin whole on
// both sides), and the spheres' positions in the container (Dynamics.Z) and on the finest level differ
// by the finest level's offset.
func TestLevelsFollow(t *testing.T) {
	c, l := settlingOnLevels(t, cases.PrecisionDouble)
	s, err := New(c, l, 0)
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	const half = cases.MinFineMarginCells
	for n := 0; n < 2*l.StepsPerPeriod; n += s.Stride() {
		if err := s.Advance(s.Stride()); err != nil {
			t.Fatal(err)
		}
		lo, hi, openLo, openHi := s.lv.gaps(s)
		if (openLo && lo < half) || (openHi && hi < half) {
			t.Fatalf("step %d: surfaces %.2f and %.2f finest cells from the ends of the finest level, below the guard's %d", n, lo, hi, half)
		}
		for k, b := range s.sw.bodies.List {
			if b.Shape.Z != s.sw.dyn.Z[k]-float64(s.zoff()) {
				t.Fatalf("step %d: sphere %d at %v on the finest level, %v - %d in the container", n, k+1, b.Shape.Z, s.sw.dyn.Z[k], s.zoff())
			}
		}
	}
	if m, _ := s.LevelMoves(); m == 0 {
		t.Error("the levels never moved")
	}
}
