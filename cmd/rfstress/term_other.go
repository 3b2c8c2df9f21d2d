//go:build !linux

package main

import "os"

// terminalColumns cannot ask the terminal here: 0 means the default width.
func terminalColumns(*os.File) int { return 0 }
