//go:build !amd64.v3

package lbm

// goFusesMultiplyAdd: with the default GOAMD64 (v1, v2) the Go compiler
// never fuses x*y + z on amd64 (see fma_v3_test.go).
const goFusesMultiplyAdd = false
