package lbm

import (
	"unsafe"

	"golang.org/x/sys/unix"
)

// adviseHuge asks Linux to back a large lattice with transparent huge
// pages (madvise MADV_HUGEPAGE; the kernel's default "madvise" mode gives
// them only on request): a step streams through eighteen planes of several
// MB each, and with 4 KB pages every stream takes a TLB miss every 512
// float64s. Best effort: an error is ignored (the memory still works).
func adviseHuge[T real](back []T) {
	const minBytes = 4 << 20
	n := len(back) * int(unsafe.Sizeof(T(0)))
	if n < minBytes {
		return
	}
	b := unsafe.Slice((*byte)(unsafe.Pointer(&back[0])), n)
	_ = unix.Madvise(b, unix.MADV_HUGEPAGE)
}
