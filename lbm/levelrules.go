package lbm

// TauCloseToOne is how close to 1 a relaxation time (tau+ or tau-) of a
// refined lattice may come: NewLevels refuses a level closer (see
// tauCloseToOne in levels.go). The case checks (package cases) refuse such
// a case first, naming the key to change.
const TauCloseToOne = tauCloseToOne
