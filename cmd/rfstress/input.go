package main

import (
	"fmt"
	"io"
	"math"
	"os"
	"strconv"

	"rfstress/circuits"
)

// stdin is where a netlist named "-" is read from.
var stdin io.Reader = os.Stdin

// stdinName is how a netlist read from stdin is named in messages.
const stdinName = "stdin"

// readNetlistSource reads a netlist file ("-": stdin, named stdinName),
// refusing anything over MaxInput.
func readNetlistSource(path string) (string, []byte, error) {
	if path != "-" {
		src, err := readInput("netlist", path)
		return path, src, err
	}
	src, err := io.ReadAll(io.LimitReader(stdin, MaxInput+1))
	if err == nil && len(src) > MaxInput {
		err = fmt.Errorf("larger than %d MiB", MaxInput>>20)
	}
	if err != nil {
		return stdinName, nil, usagef("cannot read netlist %s: %v", stdinName, err)
	}
	return stdinName, src, nil
}

// loadNetlist reads and parses one netlist file ("-": stdin); input
// errors exit 2.
func loadNetlist(path string) (*circuits.Netlist, *circuits.Circuit, error) {
	name, src, err := readNetlistSource(path)
	if err != nil {
		return nil, nil, err
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

// measuredFiles lists the measured-data files a netlist names: inputs
// that no output may overwrite.
func measuredFiles(nl *circuits.Netlist) []string {
	var out []string
	for _, r := range nl.MeasuredRefs() {
		out = append(out, r.Path)
	}
	return out
}

// netlistInputs is the netlist and every file it names.
func netlistInputs(path string, nl *circuits.Netlist) []string {
	var in []string
	if path != "-" {
		in = append(in, path)
	}
	if nl != nil {
		in = append(in, measuredFiles(nl)...)
	}
	return in
}

func parseFreq(flag, s string) (float64, error) {
	v, err := circuits.ParseValue(s, "Hz")
	if err != nil {
		return 0, usagef("--%s %s: %v (a frequency such as 10.1M)", flag, circuits.Clip(s), err)
	}
	if v <= 0 {
		return 0, usagef("--%s %s: frequency must be above zero", flag, circuits.Clip(s))
	}
	if !circuits.FreqRange.Holds(v) {
		return 0, usagef("--%s %s: outside the range a solve can trust (accepted range %s)", flag, circuits.Clip(s), circuits.FreqRange.Text())
	}
	return v, nil
}

// checkNumber rejects a non-finite or out-of-range number given to a flag.
func checkNumber(flag string, v float64, r circuits.Range) error {
	if math.IsNaN(v) || math.IsInf(v, 0) || !r.Holds(v) {
		return usagef("--%s %s: outside the accepted range %s", flag, strconv.FormatFloat(v, 'g', -1, 64), r.Text())
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
	return circuits.SkipBOM(b), nil
}

// writeTo checks one output against the inputs and writes through fn:
// atomically to a file, in place to a device or FIFO, or to stdout for
// "-". Commands with several outputs plan them all first (planOutputs).
func writeTo(path string, stdout io.Writer, inputs []string, fn func(io.Writer) error) error {
	ts, err := planOutputs([][2]string{{"output", path}}, inputs)
	if err != nil {
		return err
	}
	for _, t := range ts {
		if err := t.write(stdout, fn); err != nil {
			return err
		}
	}
	return nil
}
