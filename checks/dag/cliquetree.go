package dag

// cliqueTree returns the maximal cliques of the chordal undirected graph l
// (each sorted, local indices) and a clique tree over them as parent
// pointers (-1 for the root, clique 0). The cliques come from a maximum cardinality search (Tarjan &
// Yannakakis 1984): each node with the neighbours numbered before it forms
// a clique, and a maximal one ends wherever the next node's count of
// numbered neighbours does not grow (Blair & Peyton 1993). The tree is a
// maximum-weight spanning tree of the clique intersection graph, which is
// a clique tree of a chordal graph (Gavril 1974; Bernstein & Goodman 1981).
func cliqueTree(l *PDAG) (cliques [][]int, parent []int) {
	n := l.N()
	weight := make([]int, n)
	numbered := make([]bool, n)
	prev := -1
	var current []int
	for range n {
		v := -1
		for u := range n {
			if !numbered[u] && (v < 0 || weight[u] > weight[v]) {
				v = u
			}
		}
		if weight[v] <= prev && current != nil {
			cliques = append(cliques, current)
		}
		prev = weight[v]
		current = []int{v}
		for _, u := range l.adj[v] {
			if numbered[u] {
				current = append(current, u)
			} else {
				weight[u]++
			}
		}
		numbered[v] = true
	}
	cliques = append(cliques, current)
	for _, c := range cliques {
		sortInts(c)
	}
	return cliques, spanningTree(cliques)
}

// spanningTree joins the cliques by Prim's algorithm on the sizes of their
// pairwise intersections, largest first, rooted at clique 0.
func spanningTree(cliques [][]int) []int {
	m := len(cliques)
	parent := make([]int, m)
	best := make([]int, m)
	in := make([]bool, m)
	for i := range parent {
		parent[i], best[i] = -1, -1
	}
	next := 0
	for range m {
		in[next] = true
		cand := -1
		for j := range m {
			if in[j] {
				continue
			}
			if w := len(intersectSorted(cliques[next], cliques[j])); w > best[j] {
				best[j], parent[j] = w, next
			}
			if cand < 0 || best[j] > best[cand] {
				cand = j
			}
		}
		next = cand
	}
	return parent
}

func intersectSorted(a, b []int) []int {
	var out []int
	for i, j := 0, 0; i < len(a) && j < len(b); {
		switch {
		case a[i] < b[j]:
			i++
		case a[i] > b[j]:
			j++
		default:
			out = append(out, a[i])
			i, j = i+1, j+1
		}
	}
	return out
}

func differenceSorted(a, b []int) []int {
	var out []int
	j := 0
	for _, x := range a {
		for j < len(b) && b[j] < x {
			j++
		}
		if j == len(b) || b[j] != x {
			out = append(out, x)
		}
	}
	return out
}

func subsetSorted(a, b []int) bool { return len(differenceSorted(a, b)) == 0 }
