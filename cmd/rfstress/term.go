package main

import (
	"io"
	"os"
	"strconv"
	"strings"
)

// textWidth is the number of columns text output is fitted to: COLUMNS
// when set, else the terminal's width when stdout is one, else 0 (no
// limit: a file or a pipe gets full lines, as before).
func textWidth(stdout io.Writer) int {
	if v := strings.TrimSpace(os.Getenv("COLUMNS")); v != "" {
		if n, err := strconv.Atoi(v); err == nil && n > 0 {
			return max(n, 40)
		}
	}
	f, ok := stdout.(*os.File)
	if !ok || !isTerminal(f) {
		return 0
	}
	if n := terminalColumns(f); n > 0 {
		return max(n, 40)
	}
	return 80
}
