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
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				out[i], errs[i] = m.Tune(cases[i].F, cases[i].Load.Z)
			}
		}()
	}
	for i := range cases {
		next <- i
	}
	close(next)
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	return out, nil
}
