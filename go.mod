module rfstress

go 1.26.8
