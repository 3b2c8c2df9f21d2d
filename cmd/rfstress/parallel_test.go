package main

import "testing"

// A panic in a job on a worker reaches the caller of forEach (where run's
// recover makes it exit 3) instead of ending the process from the worker
// with the runtime's status 2, which is the status of an input error.
func TestForEachRaisesPanicInCaller(t *testing.T) {
	for _, workers := range []int{1, 2, 4} {
		got := func() (r any) {
			defer func() { r = recover() }()
			forEach(20, workers, func(i int) {
				if i == 7 {
					panic("job 7")
				}
			}, func(int) bool { return false })
			return nil
		}()
		if got != "job 7" {
			t.Errorf("%d workers: the caller saw %v, want the job's panic", workers, got)
		}
	}
}
