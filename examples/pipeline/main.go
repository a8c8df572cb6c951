// Command pipeline computes, for every row of a CSV file of counts, the
// interval or test a kofn user selects, adjusts the p-values for
// multiplicity over the whole file or within groups, and writes the
// results with their method, level and side, as an Apache Beam pipeline:
// the same program runs on Beam's local runner for development and tests
// and on a cluster runner (Flink, Spark, Dataflow) for data that outgrow
// one machine. Every number comes from the kofn library (Analyze,
// AdjustFamily); this program only wires the steps.
//
// Invented example input (experiment, segment, k, n):
//
//	experiment,segment,k,n
//	signup,mobile,33,149
//	signup,desktop,18,152
//
//	go run . --input rows.csv --output out.csv --columns experiment,segment,k,n \
//	    --analysis check --p0 0.1 --adjust holm --by experiment
//
// The README's "Beyond one machine" section gives the flags for cluster
// runners. Input lines are plain comma-separated fields (no quoting).
package main

import (
	"context"
	"flag"
	"log"
	"strings"

	"github.com/apache/beam/sdks/v2/go/pkg/beam"
	"github.com/apache/beam/sdks/v2/go/pkg/beam/x/beamx"
)

var (
	input    = flag.String("input", "", "input CSV file (local path or a path the runner can read, e.g. gs://...)")
	output   = flag.String("output", "", "output CSV file")
	columns  = flag.String("columns", "id,k,n", "the input columns in order; counts are k,n (k1,n1,k2,n2 for versus)")
	by       = flag.String("by", "", "column whose values are the families of the multiplicity adjustment (empty: the whole file)")
	analysis = flag.String("analysis", "bounds", "bounds (interval for k/n), check (exact binomial test of p0) or versus (Fisher's exact test)")
	method   = flag.String("method", "Wilson", "interval method of bounds (kofn's interval method names)")
	level    = flag.Float64("level", 0.95, "confidence level of bounds")
	side     = flag.String("side", "two-sided", "interval side of bounds: two-sided, lower bound, upper bound")
	p0       = flag.Float64("p0", 0.5, "null proportion of check")
	alt      = flag.String("alt", "two-sided", "alternative of check and versus: two-sided, lower, higher")
	adjust   = flag.String("adjust", "none", "multiplicity adjustment of the p-values (Holm, Hochberg, Hommel, BH, BY, ...) or none")
)

func main() {
	flag.Parse()
	beam.Init()
	cfg := Config{Analysis: *analysis, Columns: strings.Split(*columns, ","), By: *by, Method: *method,
		Level: *level, Side: *side, P0: *p0, Alt: *alt, Adjust: *adjust}
	if err := cfg.Validate(); err != nil {
		log.Fatal(err)
	}
	if *input == "" || *output == "" {
		log.Fatal("--input and --output are required")
	}
	p, s := beam.NewPipelineWithRoot()
	lines := textioRead(s, *input)
	Write(s, cfg, Build(s, cfg, lines), *output)
	if err := beamx.Run(context.Background(), p); err != nil {
		log.Fatal(err)
	}
}
