package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sync"

	"rfstress/circuits"
)

// MaxInput is the largest input file read (netlist, materials, profile).
// Real netlists are a few kilobytes; the limit keeps a wrong argument
// (a log, a disk image, /dev/zero) from exhausting memory.
const MaxInput = 16 << 20

// readInput reads one input file, refusing directories and anything over
// MaxInput without reading more than MaxInput+1 bytes of it.
func readInput(what, path string) ([]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, usagef("cannot read %s: %v", what, cleanErr(err))
	}
	defer f.Close()
	if st, err := f.Stat(); err == nil && st.IsDir() {
		return nil, usagef("cannot read %s %s: it is a directory", what, circuits.Clip(path))
	}
	b, err := io.ReadAll(io.LimitReader(f, MaxInput+1))
	if err != nil {
		return nil, usagef("cannot read %s %s: %v", what, circuits.Clip(path), cleanErr(err))
	}
	if len(b) > MaxInput {
		return nil, usagef("%s %s is larger than 16 MiB (input files are limited to 16 MiB; is it the right file?)", what, circuits.Clip(path))
	}
	return b, nil
}

// readText reads a materials or profile file: like readInput, with a
// UTF-8 byte-order mark dropped.
func readText(what string) func(string) ([]byte, error) {
	return func(path string) ([]byte, error) {
		b, err := readInput(what, path)
		return circuits.SkipBOM(b), err
	}
}

// cleanErr escapes the path an *fs.PathError carries.
func cleanErr(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return fmt.Errorf("%s %s: %v", pe.Op, circuits.Clip(pe.Path), pe.Err)
	}
	return fmt.Errorf("%s", circuits.Escape(err.Error()))
}

// target is one output as planned before any work is done.
type target struct {
	flag   string // the option that named it, for messages
	path   string // as given; "-" is stdout
	real   string // resolved path written (symlinks followed)
	direct bool   // a character device or FIFO: written in place, never renamed over
}

// planOutputs checks every output before anything is computed or
// written: no two outputs on one path, no output on an input (however
// reached: symlinks and hard links are resolved), nothing but regular
// files replaced, and the directory of each new file writable. So an
// exit 2 never leaves a partial set of outputs.
func planOutputs(outs [][2]string, inputs []string) ([]*target, error) {
	var ts []*target
	seen := map[string]string{}
	for _, o := range outs {
		flag, path := o[0], o[1]
		if path == "" {
			continue
		}
		t := &target{flag: flag, path: path}
		if path == "-" {
			if prev, dup := seen["-"]; dup {
				return nil, usagef("%s and %s both write to standard output (give one of them a file)", prev, flag)
			}
			seen["-"] = flag
			ts = append(ts, t)
			continue
		}
		if err := t.resolve(); err != nil {
			return nil, err
		}
		if prev, dup := seen[t.real]; dup {
			return nil, usagef("%s and %s both write to %s (give each output its own path)", prev, flag, circuits.Clip(path))
		}
		seen[t.real] = flag
		for _, in := range inputs {
			if sameFile(t.real, in) {
				return nil, usagef("refusing to overwrite input file %s with %s", circuits.Clip(path), flag)
			}
		}
		ts = append(ts, t)
	}
	return ts, nil
}

// resolve follows symlinks and decides how the target is written.
func (t *target) resolve() error {
	p := t.path
	if r, err := filepath.EvalSymlinks(p); err == nil {
		p = r
	} else if dir, derr := filepath.EvalSymlinks(filepath.Dir(p)); derr == nil {
		p = filepath.Join(dir, filepath.Base(p)) // a new file in an existing directory
	}
	abs, err := filepath.Abs(p)
	if err != nil {
		return usagef("%s %s: %v", t.flag, circuits.Clip(t.path), err)
	}
	t.real = abs
	st, err := os.Stat(abs)
	switch {
	case err == nil && st.IsDir():
		return usagef("%s %s is a directory (give a file name)", t.flag, circuits.Clip(t.path))
	case err == nil && st.Mode()&(os.ModeCharDevice|os.ModeNamedPipe) != 0:
		t.direct = true // /dev/null, /dev/stdout, a FIFO: write into it, never rename over it
		return nil
	case err == nil && !st.Mode().IsRegular():
		return usagef("%s %s is not a regular file (refusing to replace it)", t.flag, circuits.Clip(t.path))
	case err != nil && !errors.Is(err, fs.ErrNotExist):
		return usagef("%s %s: %v", t.flag, circuits.Clip(t.path), cleanErr(err))
	}
	dir := filepath.Dir(abs)
	if st, err := os.Stat(dir); err != nil || !st.IsDir() {
		return usagef("%s %s: directory %s does not exist", t.flag, circuits.Clip(t.path), circuits.Clip(filepath.Dir(t.path)))
	}
	probe, err := os.CreateTemp(dir, ".rfstress-probe-*")
	if err != nil {
		return usagef("%s %s: directory %s is not writable", t.flag, circuits.Clip(t.path), circuits.Clip(filepath.Dir(t.path)))
	}
	probe.Close()
	os.Remove(probe.Name())
	return nil
}

// sameFile tells whether output path a (resolved) is input file b.
func sameFile(a, b string) bool {
	if rb, err := filepath.EvalSymlinks(b); err == nil {
		b = rb
	}
	if ab, err := filepath.Abs(b); err == nil && ab == a {
		return true
	}
	sa, err1 := os.Stat(a)
	sb, err2 := os.Stat(b)
	return err1 == nil && err2 == nil && sa.Mode().IsRegular() && os.SameFile(sa, sb)
}

// write renders fn and puts the bytes at the target: stdout, a device or
// FIFO written in place, or a regular file replaced atomically.
func (t *target) write(stdout io.Writer, fn func(io.Writer) error) error {
	if t.path == "-" {
		return fn(stdout)
	}
	var buf bytes.Buffer
	if err := fn(&buf); err != nil {
		return err
	}
	if t.direct {
		f, err := os.OpenFile(t.real, os.O_WRONLY, 0)
		if err != nil {
			return usagef("cannot write %s: %v", circuits.Clip(t.path), cleanErr(err))
		}
		_, werr := f.Write(buf.Bytes())
		cerr := f.Close()
		if werr == nil {
			werr = cerr
		}
		if werr != nil {
			return usagef("cannot write %s: %v", circuits.Clip(t.path), cleanErr(werr))
		}
		return nil
	}
	return writeAtomic(t.real, t.path, buf.Bytes())
}

// temps are temporary files in flight, removed if a signal ends the run.
var temps = struct {
	sync.Mutex
	names map[string]bool
}{names: map[string]bool{}}

func trackTemp(name string, on bool) {
	temps.Lock()
	defer temps.Unlock()
	if on {
		temps.names[name] = true
	} else {
		delete(temps.names, name)
	}
}

// removeTemps deletes every temporary file still in flight.
func removeTemps() {
	temps.Lock()
	defer temps.Unlock()
	for n := range temps.names {
		os.Remove(n)
		delete(temps.names, n)
	}
}

// writeAtomic writes data to a temporary file beside path, flushes it to
// the disk (fsync) and renames it over path, so a crash or a full disk
// never leaves a truncated report under the real name.
func writeAtomic(path, shown string, data []byte) error {
	fail := func(err error) error {
		return usagef("cannot write %s: %v", circuits.Clip(shown), cleanErr(err))
	}
	tmp, err := os.CreateTemp(filepath.Dir(path), ".rfstress-*")
	if err != nil {
		return fail(err)
	}
	name := tmp.Name()
	trackTemp(name, true)
	defer trackTemp(name, false)
	done := false
	defer func() {
		if !done {
			tmp.Close()
			os.Remove(name)
		}
	}()
	if _, err := tmp.Write(data); err != nil {
		return fail(err)
	}
	if err := tmp.Sync(); err != nil {
		return fail(err)
	}
	if err := tmp.Chmod(0o644); err != nil {
		return fail(err)
	}
	if err := tmp.Close(); err != nil {
		return fail(err)
	}
	if err := os.Rename(name, path); err != nil {
		return fail(err)
	}
	done = true
	return nil
}
