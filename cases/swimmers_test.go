package cases

import (
	"reflect"
	"testing"
)

// TestSwimmers: spheres joined by springs or arms, directly or through
// others, are one swimmer; a lone sphere is its own; the swimmers are
// ordered along z.
func TestSwimmers(t *testing.T) {
	c := &Case{
		Spheres: []Sphere{{Z: 5}, {Z: -1}, {Z: 6}, {Z: 0}, {Z: 9}, {Z: -3}},
		Springs: []Spring{{Spheres: [2]int{1, 3}}},
		Arms:    []Arm{{Spheres: [2]int{2, 4}}, {Spheres: [2]int{4, 6}}},
	}
	want := [][]int{{1, 3, 5}, {0, 2}, {4}} // mean z -4/3, 11/2, 9
	if got := Swimmers(c); !reflect.DeepEqual(got, want) {
		t.Errorf("Swimmers = %v, want %v", got, want)
	}
}

// trainCase is the dumbbell train of the examples, coarse and short, with

// TestUnionFind: unions join sets, a repeated union reports so, and the
// sets come out ordered by their smallest member.
func TestUnionFind(t *testing.T) {
	u := NewUnionFind(5)
	if !u.Union(3, 1) || !u.Union(4, 3) || u.Union(1, 4) {
		t.Fatal("Union: want true, true, false")
	}
	if u.Find(4) != 1 {
		t.Errorf("Find(4) = %d, want 1 (the smallest member)", u.Find(4))
	}
	if got, want := u.Sets(), [][]int{{0}, {1, 3, 4}, {2}}; !reflect.DeepEqual(got, want) {
		t.Errorf("Sets = %v, want %v", got, want)
	}
}
