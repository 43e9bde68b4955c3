package cases

import "slices"

// Swimmers returns the swimmers of case c: the spheres joined, directly
// or through others, by springs or arms form one swimmer; a sphere joined
// to none is a swimmer of its own. Sphere indices are 0-based, in order
// within a swimmer, and the swimmers are ordered by their mean initial
// position along z (the first is the lowest). Pairs that name a sphere
// the case does not have are left out (validation reports them).
func Swimmers(c *Case) [][]int {
	n := len(c.Spheres)
	u := NewUnionFind(n)
	join := func(a, b int) {
		if a >= 1 && b >= 1 && a <= n && b <= n {
			u.Union(a-1, b-1)
		}
	}
	for _, s := range c.Springs {
		join(s.Spheres[0], s.Spheres[1])
	}
	for _, a := range c.Arms {
		join(a.Spheres[0], a.Spheres[1])
	}
	out := u.Sets()
	mean := func(g []int) float64 {
		var z float64
		for _, k := range g {
			z += c.Spheres[k].Z
		}
		return z / float64(len(g))
	}
	slices.SortStableFunc(out, func(a, b []int) int {
		switch ma, mb := mean(a), mean(b); {
		case ma < mb:
			return -1
		case ma > mb:
			return 1
		}
		return 0
	})
	return out
}

// UnionFind is a disjoint-set forest over 0..n-1 with path compression
// (Tarjan 1975, J. ACM 22, 215); the root of a set is its smallest member.
type UnionFind struct{ parent []int }

// NewUnionFind returns n singleton sets.
func NewUnionFind(n int) *UnionFind {
	u := &UnionFind{parent: make([]int, n)}
	for i := range u.parent {
		u.parent[i] = i
	}
	return u
}

// Find returns the root of i's set.
func (u *UnionFind) Find(i int) int {
	if u.parent[i] != i {
		u.parent[i] = u.Find(u.parent[i])
	}
	return u.parent[i]
}

// Union joins the sets of a and b and reports whether they were apart.
func (u *UnionFind) Union(a, b int) bool {
	ra, rb := u.Find(a), u.Find(b)
	if ra == rb {
		return false
	}
	u.parent[max(ra, rb)] = min(ra, rb)
	return true
}

// Sets returns the sets, each in increasing order, ordered by their
// smallest member.
func (u *UnionFind) Sets() [][]int {
	byRoot := map[int]int{}
	var out [][]int
	for i := range u.parent {
		r := u.Find(i)
		x, ok := byRoot[r]
		if !ok {
			x = len(out)
			byRoot[r] = x
			out = append(out, nil)
		}
		out[x] = append(out[x], i)
	}
	return out
}
