package lbm

// Q is the number of discrete velocities of the D2Q9 lattice.
const Q = 9

// The D2Q9 velocity set (Qian, d'Humieres & Lallemand 1992, Europhys. Lett.
// 17, 479), ordered rest, the four axis directions counter-clockwise, then
// the four diagonals counter-clockwise. Component 0 is z, component 1 is r.
var (
	// Ez and Er are the z and r components of the lattice velocities.
	Ez = [Q]int{0, 1, 0, -1, 0, 1, -1, -1, 1}
	Er = [Q]int{0, 0, 1, 0, -1, 1, 1, -1, -1}
	// W are the lattice weights.
	W = [Q]float64{4.0 / 9, 1.0 / 9, 1.0 / 9, 1.0 / 9, 1.0 / 9, 1.0 / 36, 1.0 / 36, 1.0 / 36, 1.0 / 36}
	// Opp is the opposite direction: E[Opp[i]] = -E[i].
	Opp = [Q]int{0, 3, 4, 1, 2, 7, 8, 5, 6}
	// Mirror is the image under r -> -r: Ez[Mirror[i]] = Ez[i], Er[Mirror[i]] = -Er[i].
	Mirror = [Q]int{0, 1, 4, 3, 2, 8, 7, 6, 5}
)

// Cs2 is the squared lattice speed of sound.
const Cs2 = 1.0 / 3.0

// Collision selects the collision operator.
type Collision int

const (
	// TRT is the two-relaxation-time operator (the default).
	TRT Collision = iota
	// MRT is the multiple-relaxation-time operator of Lallemand & Luo 2000.
	MRT
	// BGK is the single-relaxation-time operator, kept for tests.
	BGK
)

func (c Collision) String() string {
	switch c {
	case TRT:
		return "trt"
	case MRT:
		return "mrt"
	case BGK:
		return "bgk"
	}
	return "unknown"
}

// ParseCollision maps "trt", "mrt" or "bgk" to a Collision.
func ParseCollision(s string) (Collision, bool) {
	switch s {
	case "trt", "TRT", "":
		return TRT, true
	case "mrt", "MRT":
		return MRT, true
	case "bgk", "BGK":
		return BGK, true
	}
	return TRT, false
}
