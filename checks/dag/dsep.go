package dag

// BasisSet returns Shipley's (2000) basis set of the d-separations that
// the DAG implies: for each non-adjacent pair (u, v), u < v, taken in a
// topological order so that v is not an ancestor of u, the statement
// u ⊥ v | pa(u) ∪ pa(v). Only nodes marked in include take part (nil
// means all). The pairs come sorted by (u, v).
func BasisSet(g *PDAG, include []bool) []Implication {
	var out []Implication
	for u := range g.N() {
		for v := u + 1; v < g.N(); v++ {
			if (include != nil && (!include[u] || !include[v])) || g.Adjacent(u, v) {
				continue
			}
			out = append(out, Implication{X: u, Y: v, Given: unionSorted(g.Parents(u), g.Parents(v))})
		}
	}
	return out
}

// Implication is one d-separation statement X ⊥ Y | Given.
type Implication struct {
	X, Y  int
	Given []int
}

func unionSorted(a, b []int) []int {
	out := make([]int, 0, len(a)+len(b))
	i, j := 0, 0
	for i < len(a) || j < len(b) {
		switch {
		case j == len(b) || (i < len(a) && a[i] < b[j]):
			out = append(out, a[i])
			i++
		case i == len(a) || b[j] < a[i]:
			out = append(out, b[j])
			j++
		default:
			out = append(out, a[i])
			i, j = i+1, j+1
		}
	}
	return out
}
