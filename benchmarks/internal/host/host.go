// Package host describes the machine a benchmark runs on, for the headers
// of the benchmark programs' tables.
package host

import (
	"bufio"
	"os"
	"runtime"
	"strings"
)

// CPUModel returns the "model name" of the first processor in
// /proc/cpuinfo, or the architecture if there is none.
func CPUModel() string {
	f, err := os.Open("/proc/cpuinfo")
	if err != nil {
		return runtime.GOARCH
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		k, v, ok := strings.Cut(sc.Text(), ":")
		if ok && strings.TrimSpace(k) == "model name" {
			return strings.TrimSpace(v)
		}
	}
	return runtime.GOARCH
}
