// Package hammer is the tests' check of concurrent use: it runs one
// computation from many goroutines at once and compares every answer with
// the one computed alone. Under "go test -race" (run by .ci/run) it also
// shows the absence of data races.
package hammer

import (
	"strconv"
	"strings"
	"sync"
	"testing"
)

// Run calls f from 16 goroutines, 50 times each, and reports any answer
// that differs from the one f gives alone (compared digit for digit, so
// NaN equals NaN).
func Run(tb testing.TB, f func() []float64) {
	tb.Helper()
	want := key(f())
	var wg sync.WaitGroup
	errs := make(chan string, 16)
	for range 16 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for range 50 {
				if got := key(f()); got != want {
					errs <- got
					return
				}
			}
		}()
	}
	wg.Wait()
	close(errs)
	for e := range errs {
		tb.Errorf("concurrent answer %s, alone %s", e, want)
	}
}

func key(v []float64) string {
	s := make([]string, len(v))
	for i, x := range v {
		s[i] = strconv.FormatFloat(x, 'g', -1, 64)
	}
	return strings.Join(s, " ")
}
