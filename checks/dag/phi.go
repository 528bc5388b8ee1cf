package dag

import "math/big"

// phi counts the orders of s (global ids) that respect c.req inside s and
// do not begin with any set of r, by the recursion
//
//	φ(S, R) = LE(S) − Σ_i LE(S∖R_i) · φ(R_i, {R_j ⊊ R_i})
//
// over the distinct sets R_i of r taken by size, where LE(T) counts the
// orders of T that respect the constraints, and a term counts only when no
// constraint points from S∖R_i into R_i.
func (c *counter) phi(s []int, r [][]int) (*big.Int, error) {
	r = distinctBySize(r)
	total, err := c.linearExtensions(s)
	if err != nil {
		return nil, err
	}
	for i, ri := range r {
		if len(ri) == len(s) {
			return new(big.Int), nil
		}
		rest := differenceSorted(s, ri)
		if c.pointsInto(rest, ri) {
			continue
		}
		var smaller [][]int
		for _, rj := range r[:i] {
			if len(rj) < len(ri) && subsetSorted(rj, ri) {
				smaller = append(smaller, rj)
			}
		}
		inner, err := c.phi(ri, smaller)
		if err != nil {
			return nil, err
		}
		le, err := c.linearExtensions(rest)
		if err != nil {
			return nil, err
		}
		total.Sub(total, inner.Mul(inner, le))
	}
	return total, nil
}

// pointsInto reports whether a required arc leads from a node of from to a
// node of to.
func (c *counter) pointsInto(from, to []int) bool {
	if len(c.req) == 0 {
		return false
	}
	for _, u := range from {
		for _, v := range to {
			if c.req[Edge{u, v}] {
				return true
			}
		}
	}
	return false
}

// linearExtensions counts the orders of t (global ids) in which every
// required arc between two nodes of t points forward. With k constrained
// nodes (ends of such arcs) it is |t|!/k! times the number of orders of
// those k alone, which orderCount finds.
func (c *counter) linearExtensions(t []int) (*big.Int, error) {
	var cons []int
	for _, u := range t {
		for _, v := range t {
			if c.req[Edge{u, v}] || c.req[Edge{v, u}] {
				cons = append(cons, u)
				break
			}
		}
	}
	n := new(big.Int).MulRange(int64(len(cons))+1, int64(len(t)))
	if len(cons) == 0 {
		return n, nil
	}
	k, err := orderCount(cons, func(u, v int) bool { return c.req[Edge{u, v}] })
	if err != nil {
		return nil, err
	}
	return n.Mul(n, k), nil
}
