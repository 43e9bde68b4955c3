// Package verify holds axiswim's verification cases: runs of the solver
// compared with analytic solutions and published values, each reported as a
// Row that names its source and its tolerance. The same cases back
// `axiswim verify` and the package's tests; the longer convergence studies
// run only with `axiswim verify -full`.
package verify
