package dag

// d-separation by search is the tests' oracle: the binary derives the
// implied independences from the basis set (BasisSet), and the tests check
// each of them, and the non-implications, against this search.

import (
	"math/rand/v2"
	"testing"
)

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

// Every statement of the basis set holds by d-separation in random DAGs,
// and every non-adjacent pair gets one (Shipley 2000: the basis set is
// complete for the independences the DAG implies).
func TestBasisSet_DSeparatedOracle(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 8))
	for range 200 {
		g := randomDAG(r, 2+r.IntN(8), 0.2+0.5*r.Float64())
		pairs := 0
		for u := range g.N() {
			for v := u + 1; v < g.N(); v++ {
				if !g.Adjacent(u, v) {
					pairs++
				}
			}
		}
		basis := BasisSet(g, nil)
		if len(basis) != pairs {
			t.Fatalf("%d statements for %d non-adjacent pairs", len(basis), pairs)
		}
		for _, s := range basis {
			if !DSeparated(g, s.X, s.Y, s.Given) {
				t.Fatalf("%d ⊥ %d | %v is in the basis set but not d-separated", s.X, s.Y, s.Given)
			}
		}
	}
}
