package cases

import (
	"bufio"
	"os"
	"strconv"
	"strings"

	"axiswim/lbm"
)

// fallbackMemoryLimit is used when /proc/meminfo cannot be read.
const fallbackMemoryLimit = 16 << 30

// memoryBytes estimates the memory of an nz x nr grid with one ghost layer
// on each side,
// with the bytes per node of lbm.BytesPerNode.
func memoryBytes(nz, nr float64, single bool) float64 {
	return float64(lbm.BytesPerNode(single)) * (nz + 2) * (nr + 2)
}

// MemoryBytes is the estimated memory of the lattice, in bytes: on refined
// levels, of all levels (Layout.MemoryBytes).
func (l *Lattice) MemoryBytes() int64 {
	if l.Levels > 1 {
		return l.layout.MemoryBytes
	}
	return int64(memoryBytes(float64(l.Nz), float64(l.Nr), l.Single))
}

// MemoryLimit returns the largest grid memory Validate accepts, in bytes:
// 80% of the physical memory given by /proc/meminfo, or 16 GiB if that
// cannot be read. source says which.
func MemoryLimit() (bytes int64, source string) {
	total, err := memTotal()
	if err != nil || total <= 0 {
		return fallbackMemoryLimit, "16 GiB default: physical memory unknown"
	}
	return total / 10 * 8, "80% of physical memory"
}

// memTotal reads MemTotal from /proc/meminfo, in bytes.
func memTotal() (int64, error) {
	f, err := os.Open("/proc/meminfo")
	if err != nil {
		return 0, err
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		rest, ok := strings.CutPrefix(sc.Text(), "MemTotal:")
		if !ok {
			continue
		}
		fields := strings.Fields(rest)
		if len(fields) == 0 {
			break
		}
		kb, err := strconv.ParseInt(fields[0], 10, 64)
		if err != nil {
			return 0, err
		}
		return kb * 1024, nil
	}
	if err := sc.Err(); err != nil {
		return 0, err
	}
	return 0, os.ErrNotExist
}
