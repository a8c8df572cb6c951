package test

import (
	"context"
	"testing"
)

// BenchmarkBarnardLimit and BenchmarkBoschlooLimit run the unconditional
// tests at the size limit, 2000 x 2000 tables.
func BenchmarkBarnardLimit(b *testing.B) {
	for b.Loop() {
		_, _ = Barnard(context.Background(), 900, 2000, 960, 2000, UnconditionalOptions{})
	}
}

func BenchmarkBoschlooLimit(b *testing.B) {
	for b.Loop() {
		_, _ = Boschloo(context.Background(), 900, 2000, 960, 2000, UnconditionalOptions{})
	}
}
