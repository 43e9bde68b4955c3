//go:build amd64.v3

package lbm

// goFusesMultiplyAdd: built with GOAMD64=v3 or later, the Go compiler fuses
// x*y + z into one FMA instruction (the Go spec allows it), so the portable
// kernel rounds differently from the SIMD one, which never fuses.
const goFusesMultiplyAdd = true
