package dag

import "container/heap"

// FindCycle returns a directed cycle among the arcs of g, as the nodes in
// order (the first node is not repeated at the end), or nil if the arcs
// form no cycle. Lines are ignored. The search is a depth-first search that
// starts from the lowest-numbered node, so the result is deterministic.
func FindCycle(g *PDAG) []int {
	const (
		white = iota
		grey
		black
	)
	colour := make([]int8, g.N())
	var stack []int
	var cycle []int
	var visit func(u int) bool
	visit = func(u int) bool {
		colour[u] = grey
		stack = append(stack, u)
		for _, v := range g.Children(u) {
			switch colour[v] {
			case grey:
				for i, w := range stack {
					if w == v {
						cycle = append([]int(nil), stack[i:]...)
					}
				}
				return true
			case white:
				if visit(v) {
					return true
				}
			}
		}
		stack = stack[:len(stack)-1]
		colour[u] = black
		return false
	}
	for u := range g.N() {
		if colour[u] == white && visit(u) {
			return cycle
		}
	}
	return nil
}

type intHeap []int

func (h intHeap) Len() int           { return len(h) }
func (h intHeap) Less(i, j int) bool { return h[i] < h[j] }
func (h intHeap) Swap(i, j int)      { h[i], h[j] = h[j], h[i] }
func (h *intHeap) Push(x any)        { *h = append(*h, x.(int)) }
func (h *intHeap) Pop() any {
	old := *h
	x := old[len(old)-1]
	*h = old[:len(old)-1]
	return x
}

// TopoOrder returns the nodes of g ordered so that every arc points
// forward, taking the lowest-numbered available node first (Kahn 1962), so
// the order is deterministic. Lines are ignored. ok is false when the arcs
// have a cycle; FindCycle then names it.
func TopoOrder(g *PDAG) (order []int, ok bool) {
	indeg := make([]int, g.N())
	for u := range g.N() {
		indeg[u] = len(g.Parents(u))
	}
	h := &intHeap{}
	for u, d := range indeg {
		if d == 0 {
			*h = append(*h, u)
		}
	}
	heap.Init(h)
	for h.Len() > 0 {
		u := heap.Pop(h).(int)
		order = append(order, u)
		for _, v := range g.Children(u) {
			if indeg[v]--; indeg[v] == 0 {
				heap.Push(h, v)
			}
		}
	}
	return order, len(order) == g.N()
}

// HasDirectedPath reports whether a directed path of arcs leads from u to v
// (u ≠ v).
func HasDirectedPath(g *PDAG, u, v int) bool {
	seen := make([]bool, g.N())
	stack := []int{u}
	seen[u] = true
	for len(stack) > 0 {
		w := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		for _, c := range g.Children(w) {
			if c == v {
				return true
			}
			if !seen[c] {
				seen[c] = true
				stack = append(stack, c)
			}
		}
	}
	return false
}
