package main

import "rfstress/reports"

// writePDF draws the stress report.
var writePDF = reports.WritePDF
