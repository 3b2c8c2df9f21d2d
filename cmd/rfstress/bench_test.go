package main

import (
	"io"
	"path/filepath"
	"syscall"
	"testing"
	"time"
)

// benchBank runs the audit command in process over the example station's
// bank (every netlist in testdata/station), with or without its PDF.
func benchBank(b *testing.B, pdf bool) {
	files, err := filepath.Glob("../../testdata/station/*.net")
	if err != nil || len(files) == 0 {
		b.Skip("no example station")
	}
	args := append([]string{"audit"}, files...)
	if pdf {
		args = append(args, "--report", filepath.Join(b.TempDir(), "bank.pdf"))
	}
	b.Setenv("SOURCE_DATE_EPOCH", "1700000000")
	b.ReportAllocs()
	cpu0 := cpuTime()
	for b.Loop() {
		if code := run(args, io.Discard, io.Discard); code > 1 {
			b.Fatalf("exit %d", code)
		}
	}
	b.ReportMetric(float64(len(files)), "files")
	b.ReportMetric((cpuTime()-cpu0).Seconds()*1e3/float64(b.N), "cpu-ms/op")
}

// cpuTime is the CPU time the process has used, every thread counted: on
// a busy machine it shows the work where wall time shows the queue.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

func BenchmarkBankText(b *testing.B) { benchBank(b, false) }
func BenchmarkBankPDF(b *testing.B)  { benchBank(b, true) }
