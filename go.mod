module rfstress

go 1.26.8

require github.com/spf13/pflag v1.1.0 // indirect
