package tuning

import (
	"runtime"
	"sync"
)

// TuneAll tunes every case with up to workers goroutines (0: one per
// CPU). Each case is tuned serially and alone, and results are placed by
// case index, so the settings are the same to the last digit whatever the
// number of workers.
func (m *Matcher) TuneAll(cases []Case, workers int) ([]Result, error) {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	out := make([]Result, len(cases))
	errs := make([]error, len(cases))
	var wg sync.WaitGroup
	next := make(chan int)
	faults := make([]*struct{ v any }, len(cases))
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				// a panic is kept with its case and raised again in the
				// caller's goroutine, whose recover reports it (exit 3);
				// in a worker it would end the process with status 2
				func() {
					defer func() {
						if r := recover(); r != nil {
							faults[i] = &struct{ v any }{r}
						}
					}()
					out[i], errs[i] = m.Tune(cases[i].F, cases[i].Load.Z)
				}()
			}
		}()
	}
	for i := range cases {
		next <- i
	}
	close(next)
	wg.Wait()
	for _, f := range faults {
		if f != nil {
			panic(f.v)
		}
	}
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	return out, nil
}
