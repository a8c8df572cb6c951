package main

import (
	"context"
	"fmt"

	"github.com/kofnlab/kofn/test"
)

func main() {
	ctx := context.Background()
	r, err := test.Boschloo(ctx, 33, 149, 18, 152, test.UnconditionalOptions{Fisher: test.FisherCentral})
	fmt.Println(r.PValue, r.Statistic, r.Nuisance, err)
	for _, a := range []test.Alternative{test.Greater, test.Less} {
		r, err = test.Boschloo(ctx, 33, 149, 18, 152, test.UnconditionalOptions{Alternative: a})
		fmt.Println(a, r.PValue, r.Statistic, err)
	}
}
