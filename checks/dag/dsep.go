package dag

// DSeparated reports whether x and y are d-separated by the set z in the
// DAG g (Pearl 1988). It uses the reachability ("Bayes ball") search of
// Koller & Friedman (2009), Probabilistic Graphical Models, algorithm 3.1:
// a trail is followed through a node in z only when the node is a collider
// on it, and through a collider only when the collider is in z or has a
// descendant in z. x and y must not be in z. Lines are ignored.
func DSeparated(g *PDAG, x, y int, z []int) bool {
	n := g.N()
	inZ := make([]bool, n)
	for _, v := range z {
		inZ[v] = true
	}
	anc := ancestorsOf(g, z) // z and its ancestors
	const (
		up   = 0 // arrived from a child
		down = 1 // arrived from a parent
	)
	type visit struct{ node, dir int }
	seen := make([][2]bool, n)
	queue := []visit{{x, up}}
	for len(queue) > 0 {
		cur := queue[0]
		queue = queue[1:]
		if seen[cur.node][cur.dir] {
			continue
		}
		seen[cur.node][cur.dir] = true
		if cur.node == y && !inZ[y] {
			return false
		}
		if cur.dir == up && !inZ[cur.node] {
			for _, p := range g.Parents(cur.node) {
				queue = append(queue, visit{p, up})
			}
			for _, c := range g.Children(cur.node) {
				queue = append(queue, visit{c, down})
			}
		}
		if cur.dir == down {
			if !inZ[cur.node] {
				for _, c := range g.Children(cur.node) {
					queue = append(queue, visit{c, down})
				}
			}
			if anc[cur.node] {
				for _, p := range g.Parents(cur.node) {
					queue = append(queue, visit{p, up})
				}
			}
		}
	}
	return true
}

// ancestorsOf marks the nodes of set and every ancestor of one of them.
func ancestorsOf(g *PDAG, set []int) []bool {
	mark := make([]bool, g.N())
	stack := append([]int(nil), set...)
	for _, v := range set {
		mark[v] = true
	}
	for len(stack) > 0 {
		v := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		for _, p := range g.Parents(v) {
			if !mark[p] {
				mark[p] = true
				stack = append(stack, p)
			}
		}
	}
	return mark
}

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
