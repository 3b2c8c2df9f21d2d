package main

import (
	"fmt"
	"io"

	"rfstress/reports"
)

// writePDF is swapped for reports.WritePDF once the report exists.
var writePDF = func(w io.Writer, doc *reports.ReportDoc) error { return fmt.Errorf("PDF report not available") }
