package dag

import (
	"fmt"
	"math/big"
	"math/rand/v2"
	"slices"
	"testing"
)

// Labelled DAGs on n = 1..5 nodes: OEIS A003024 (Robinson 1973).
// Markov equivalence classes on n = 1..5 nodes: OEIS A007984 (Gillispie &
// Perlman 2002).
var classCounts = []struct{ n, dags, classes int }{
	{1, 1, 1}, {2, 3, 2}, {3, 25, 11}, {4, 543, 185}, {5, 29281, 8782},
}

func TestClassSize_AllDAGs(t *testing.T) {
	for _, tc := range classCounts {
		t.Run(fmt.Sprint(tc.n), func(t *testing.T) {
			members := map[string]int{}
			var reps []*PDAG
			dags := 0
			allDAGs(tc.n, func(g *PDAG) {
				dags++
				k := CPDAG(g).Key()
				if members[k] == 0 {
					reps = append(reps, CPDAG(g))
				}
				members[k]++
			})
			if dags != tc.dags || len(members) != tc.classes {
				t.Fatalf("got %d DAGs in %d classes, want %d in %d",
					dags, len(members), tc.dags, tc.classes)
			}
			sum := new(big.Int)
			for _, c := range reps {
				size := ClassSize(c)
				if size.Int64() != int64(members[c.Key()]) {
					t.Fatalf("class %s: counted %v, enumerated %d", c.Key(), size, members[c.Key()])
				}
				sum.Add(sum, size)
			}
			if sum.Int64() != int64(tc.dags) {
				t.Fatalf("class sizes sum to %v, want %d", sum, tc.dags)
			}
		})
	}
}

// Class-size histogram for n = 4 (size: number of classes), computed by
// enumerating all labelled DAGs on four nodes and grouping them by
// d-separation; the counts add to 185 classes (OEIS A007984) and
// Σ size·classes = 543 DAGs (OEIS A003024).
func TestClassSize_Histogram4(t *testing.T) {
	want := map[int64]int{1: 59, 2: 48, 3: 36, 4: 19, 6: 4, 8: 12, 10: 6, 24: 1}
	got := map[int64]int{}
	seen := map[string]bool{}
	allDAGs(4, func(g *PDAG) {
		c := CPDAG(g)
		if !seen[c.Key()] {
			seen[c.Key()] = true
			got[ClassSize(c).Int64()]++
		}
	})
	for size, n := range want {
		if got[size] != n {
			t.Errorf("size %d: %d classes, want %d", size, got[size], n)
		}
	}
}

// Closed forms for a connected chordal component with p nodes, He, Jia &
// Yu (2015), JMLR 16 (recalled from memory); checked here also by brute
// force for p ≤ 7.
func TestClassSize_ClosedForms(t *testing.T) {
	for p := 3; p <= 9; p++ {
		var path, triangleTree [][2]int
		for i := 0; i+1 < p; i++ {
			path = append(path, [2]int{i, i + 1})
		}
		triangleTree = append(slices.Clone(path), [2]int{0, 2})
		cases := []struct {
			name string
			g    *PDAG
			want int64
		}{
			{"tree", undirected(p, path), int64(p)},
			{"triangle plus tree", undirected(p, triangleTree), int64(2 * p)},
			{"complete", complete(p), factorial(p)},
			{"complete minus one edge", complete(p, [2]int{0, 1}), 2*factorial(p-1) - factorial(p-2)},
			{"complete minus two edges at a node", complete(p, [2]int{0, 1}, [2]int{0, 2}),
				int64(p*p-p-4) * factorial(p-3)},
		}
		for _, tc := range cases {
			got := ClassSize(tc.g)
			if got.Int64() != tc.want {
				t.Errorf("p=%d %s: %v, want %d", p, tc.name, got, tc.want)
			}
			if p <= 7 {
				if bf := len(bruteMembers(tc.g, nil)); int64(bf) != tc.want {
					t.Errorf("p=%d %s: brute force %d, want %d", p, tc.name, bf, tc.want)
				}
			}
		}
	}
	if got := ClassSize(complete(4, [2]int{0, 1})).Int64(); got != 10 { // K4 − e: 10
		t.Errorf("K4 − e: %d", got)
	}
	if got := ClassSize(complete(5, [2]int{0, 1})).Int64(); got != 42 { // K5 − e: 42
		t.Errorf("K5 − e: %d", got)
	}
}

// The polynomial counter and the member listing against brute force on
// 1,200 random DAGs with 2 to 8 nodes, without and with background
// knowledge.
func TestClassSize_RandomAgainstBruteForce(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for i := range 1200 {
		n := 2 + r.IntN(7)
		g := randomDAG(r, n, 0.2+0.7*r.Float64())
		c := CPDAG(g)
		req := randomBackground(r, g)
		all := bruteMembers(c, nil)
		if _, ok := all[g.Key()]; !ok {
			t.Fatalf("graph %d: %s is not in its own class", i, g.Key())
		}
		if got := ClassSize(c); got.Int64() != int64(len(all)) {
			t.Fatalf("graph %d (%s): counted %v, brute force %d", i, g.Key(), got, len(all))
		}
		plausible := map[string]*PDAG{}
		for k, m := range all {
			if hasAll(m, req) {
				plausible[k] = m
			}
		}
		got, err := PlausibleSize(c, req)
		if err != nil {
			t.Fatal(err)
		}
		if got.Int64() != int64(len(plausible)) {
			t.Fatalf("graph %d (%s) with %v: counted %v, brute force %d",
				i, g.Key(), req, got, len(plausible))
		}
		listed, truncated, err := Members(c, req, len(plausible)+1)
		if err != nil || truncated || len(listed) != len(plausible) {
			t.Fatalf("graph %d: listed %d (truncated %v, %v), want %d",
				i, len(listed), truncated, err, len(plausible))
		}
		for _, m := range listed {
			if _, ok := plausible[m.Key()]; !ok {
				t.Fatalf("graph %d: listed %s, not a plausible member", i, m.Key())
			}
		}
	}
}

// Twenty disjoint complete five-node blocks: (5!)^20 = 120^20 members, far
// past any machine integer (report-format.md uses this example).
func TestClassSize_DisjointBlocks(t *testing.T) {
	var lines [][2]int
	for b := range 20 {
		for u := range 5 {
			for v := u + 1; v < 5; v++ {
				lines = append(lines, [2]int{5*b + u, 5*b + v})
			}
		}
	}
	want := new(big.Int).Exp(big.NewInt(120), big.NewInt(20), nil)
	if got := ClassSize(New(100, nil, lines)); got.Cmp(want) != 0 {
		t.Fatalf("got %v, want 120^20 = %v", got, want)
	}
}

func TestMembers_Truncated(t *testing.T) {
	c := complete(5)
	got, truncated, err := Members(c, nil, 7)
	if err != nil || !truncated || len(got) != 7 {
		t.Fatalf("got %d members, truncated %v, err %v", len(got), truncated, err)
	}
	again, _, _ := Members(c, nil, 7)
	for i := range got {
		if got[i].Key() != again[i].Key() {
			t.Fatalf("member %d differs between runs", i)
		}
	}
	all, truncated, _ := Members(c, nil, 120)
	if truncated || len(all) != 120 {
		t.Fatalf("K5: %d members, truncated %v; want 120", len(all), truncated)
	}
}
