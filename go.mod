module rfstress

go 1.26.8

require (
	github.com/jung-kurt/gofpdf v1.16.2
	github.com/spf13/pflag v1.1.0
	gonum.org/v1/gonum v0.17.0
)

require golang.org/x/tools v0.30.0 // indirect
