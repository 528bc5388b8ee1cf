package render

import (
	"fmt"
	"math/rand/v2"
	"testing"
)

// BenchmarkLayOut lays out seeded random DAGs of n variables with about
// 4 arrows each.
func BenchmarkLayOut(b *testing.B) {
	for _, n := range []int{10, 40, 80} {
		rng := rand.New(rand.NewPCG(uint64(n), 3))
		in, _ := randomGraph(rng, n, 8, false, false, false)
		b.Run(fmt.Sprintf("n=%d arcs=%d", n, len(in.Arcs)), func(b *testing.B) {
			for b.Loop() {
				if _, err := LayOut(in); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
