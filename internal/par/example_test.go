package par_test

import (
	"fmt"

	"github.com/phigrid/phigrid/internal/par"
)

// A dot product over fixed blocks: the partial sums are added in block
// order, so the result is the same for any number of workers.
func Example() {
	x := make([]float64, 1000)
	for i := range x {
		x[i] = 1 / float64(i+1)
	}
	parts := make([]float64, par.Blocks)
	for _, workers := range []int{1, 2, 3} {
		p := par.New(workers)
		p.For(par.Blocks, func(lo, hi int) {
			for b := lo; b < hi; b++ {
				i0, i1 := par.Split(len(x), b, par.Blocks)
				var s float64
				for _, v := range x[i0:i1] {
					s += v * v
				}
				parts[b] = s
			}
		})
		p.Close()
		fmt.Printf("%d workers: %.15f\n", workers, par.Sum(parts))
	}
	// Output:
	// 1 workers: 1.643934566681561
	// 2 workers: 1.643934566681561
	// 3 workers: 1.643934566681561
}
