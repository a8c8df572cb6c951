package onesample

import "github.com/kofnlab/kofn/binom"

func newDist(n int64, p float64) binom.Dist { return binom.Dist{N: n, P: p} }
