package main

import (
	"bufio"
	"os"
	"runtime"
	"strings"
)

// cpuModel returns the "model name" of the first processor in
// /proc/cpuinfo, or the architecture if there is none (as the kernel
// benchmark's header does).
func cpuModel() string {
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
