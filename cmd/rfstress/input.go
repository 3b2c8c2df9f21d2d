package main

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"rfstress/circuits"
)

// stdin is where a netlist named "-" is read from.
var stdin io.Reader = os.Stdin

// stdinName is how a netlist read from stdin is named in messages.
const stdinName = "stdin"

// loadNetlist reads and parses one netlist file ("-": stdin); input
// errors exit 2.
func loadNetlist(path string) (*circuits.Netlist, *circuits.Circuit, error) {
	var src []byte
	var err error
	name := path
	if path == "-" {
		name = stdinName
		src, err = io.ReadAll(io.LimitReader(stdin, maxNetlistBytes+1))
		if err == nil && len(src) > maxNetlistBytes {
			err = fmt.Errorf("larger than %d MiB", maxNetlistBytes>>20)
		}
	} else {
		src, err = os.ReadFile(path)
	}
	if err != nil {
		return nil, nil, usagef("cannot read netlist %s: %v", name, err)
	}
	nl, err := circuits.Parse(name, src)
	if err != nil {
		return nil, nil, usageError{err}
	}
	if err := circuits.LoadMeasured(nl, readMeasured); err != nil {
		return nil, nil, usageError{err}
	}
	c, err := circuits.Build(nl)
	if err != nil {
		return nil, nil, usageError{err}
	}
	return nl, c, nil
}

// maxNetlistBytes bounds a netlist read from a pipe.
const maxNetlistBytes = 16 << 20

func parseFreq(flag, s string) (float64, error) {
	v, err := circuits.ParseValue(s, "Hz")
	if err != nil {
		return 0, usagef("--%s %s: %v (a frequency such as 10.1M)", flag, s, err)
	}
	if v <= 0 {
		return 0, usagef("--%s %s: frequency must be above zero", flag, s)
	}
	return v, nil
}

// output opens PATH for writing, or stdout for "-". Files are written to a
// temporary name and renamed on Close so a failed run leaves no half file;
// inputs are never overwritten.
type output struct {
	w    io.Writer
	f    *os.File
	path string
	buf  bytes.Buffer
}

func openOutput(path string, stdout io.Writer, inputs []string) (*output, error) {
	if path == "-" {
		return &output{w: stdout}, nil
	}
	abs, _ := filepath.Abs(path)
	for _, in := range inputs {
		ai, _ := filepath.Abs(in)
		if ai == abs {
			return nil, usagef("refusing to overwrite input file %s", path)
		}
	}
	o := &output{path: path}
	o.w = &o.buf
	return o, nil
}

func (o *output) Write(p []byte) (int, error) { return o.w.Write(p) }

// Close writes the buffered bytes atomically.
func (o *output) Close() error {
	if o.path == "" {
		return nil
	}
	return writeAtomic(o.path, o.buf.Bytes())
}

func writeAtomic(path string, data []byte) error {
	dir := filepath.Dir(path)
	tmp, err := os.CreateTemp(dir, ".rfstress-*")
	if err != nil {
		return fmt.Errorf("cannot write %s: %v", path, err)
	}
	name := tmp.Name()
	if _, err := tmp.Write(data); err != nil {
		tmp.Close()
		os.Remove(name)
		return fmt.Errorf("cannot write %s: %v", path, err)
	}
	if err := tmp.Close(); err != nil {
		os.Remove(name)
		return fmt.Errorf("cannot write %s: %v", path, err)
	}
	if err := os.Chmod(name, 0o644); err != nil {
		os.Remove(name)
		return err
	}
	if err := os.Rename(name, path); err != nil {
		os.Remove(name)
		return fmt.Errorf("cannot write %s: %v", path, err)
	}
	return nil
}

// readMeasured reads a measured-data file named by a netlist, refusing
// files over circuits.MaxMeasuredBytes rather than reading them whole.
func readMeasured(path string) ([]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	b, err := io.ReadAll(io.LimitReader(f, circuits.MaxMeasuredBytes+1))
	if err != nil {
		return nil, err
	}
	if len(b) > circuits.MaxMeasuredBytes {
		return nil, fmt.Errorf("larger than %d MiB", circuits.MaxMeasuredBytes>>20)
	}
	return b, nil
}
