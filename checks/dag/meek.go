package dag

// Meek's (1995) orientation rules, each for turning the line a − b into
// the arc a → b:
//
//	R1  c → a, c and b non-adjacent
//	R2  a → c → b
//	R3  a − c → b and a − d → b, c and d non-adjacent
//	R4  d → c → b, a adjacent to c and to d, b and d non-adjacent
//
// From a skeleton with its v-structures oriented, closing under R1–R3 gives
// the CPDAG (Meek 1995, theorem 2); R4 is needed only once background
// knowledge has oriented further arcs.

// implied reports whether one of the rules orients the line a − b as a → b.
func (g *PDAG) implied(a, b int, r4 bool) bool {
	var viaR3 []int
	for k, c := range g.adj[a] {
		switch g.mark[a][k] {
		case arcIn: // c → a
			if !g.Adjacent(c, b) {
				return true // R1
			}
		case arcOut: // a → c
			if g.HasArc(c, b) {
				return true // R2
			}
		case line:
			if g.HasArc(c, b) {
				viaR3 = append(viaR3, c)
			}
		}
	}
	for i, c := range viaR3 {
		for _, d := range viaR3[i+1:] {
			if !g.Adjacent(c, d) {
				return true // R3
			}
		}
	}
	return r4 && g.impliedR4(a, b)
}

func (g *PDAG) impliedR4(a, b int) bool {
	for k, c := range g.adj[b] {
		if g.mark[b][k] != arcIn || !g.Adjacent(a, c) {
			continue
		}
		for _, d := range g.Parents(c) {
			if d != a && g.Adjacent(a, d) && !g.Adjacent(b, d) {
				return true
			}
		}
	}
	return false
}

// closeUnderMeek orients every line of g that the rules imply, starting
// from the lines in pending and following each new arc to the lines it can
// affect. It returns the arcs it made, in the order it made them.
func (g *PDAG) closeUnderMeek(pending [][2]int, r4 bool) []Edge {
	var made []Edge
	push := func(u int) {
		for k, v := range g.adj[u] {
			if g.mark[u][k] == line {
				pending = append(pending, [2]int{u, v})
			}
		}
	}
	for len(pending) > 0 {
		p := pending[len(pending)-1]
		pending = pending[:len(pending)-1]
		a, b := p[0], p[1]
		if !g.HasLine(a, b) {
			continue
		}
		switch {
		case g.implied(a, b, r4):
		case g.implied(b, a, r4):
			a, b = b, a
		default:
			continue
		}
		g.Orient(a, b)
		made = append(made, Edge{a, b})
		push(a)
		push(b)
		if r4 {
			for _, c := range g.Children(b) {
				push(c)
			}
		}
	}
	return made
}

// CloseUnderMeek orients every line of g implied by Meek's rules R1–R4 and
// returns the arcs it made. Use it after orienting background knowledge.
func (g *PDAG) CloseUnderMeek() []Edge { return g.closeUnderMeek(g.Lines(), true) }
