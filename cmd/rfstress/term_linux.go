package main

import (
	"os"
	"syscall"
	"unsafe"
)

// terminalColumns asks the terminal for its width (TIOCGWINSZ); 0 when
// it cannot tell.
func terminalColumns(f *os.File) int {
	var ws struct{ row, col, x, y uint16 }
	_, _, errno := syscall.Syscall(syscall.SYS_IOCTL, f.Fd(), uintptr(syscall.TIOCGWINSZ), uintptr(unsafe.Pointer(&ws)))
	if errno != 0 {
		return 0
	}
	return int(ws.col)
}
