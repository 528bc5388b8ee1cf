package dag

import (
	"math/big"
	"math/bits"
	"slices"
)

// orderCount counts the orders of the nodes vs in which every arc u → v
// (arc(u, v) true) points forward: the linear extensions of the relation.
// Nodes with the same predecessors and the same successors among vs
// (twins, such as the members of one tier) are interchangeable, so a class
// of m twins contributes m! times the orders in which its members come in
// a fixed sequence. A dynamic programme then runs over how many of each
// class are placed, Π (m_c + 1) states in place of 2^|vs|: tiers of sizes
// s_1..s_k alone take Π (s_i + 1) states, not 2^Σs_i, and give Π s_i!.
// More than MaxOrderStates states, or a count past 2^64 before the
// factorials, gives ErrTooConstrained.
func orderCount(vs []int, arc func(u, v int) bool) (*big.Int, error) {
	classes, need := twinClasses(vs, arc)
	radix := make([]int, len(classes))
	states := 1
	for i, cl := range classes {
		radix[i] = len(cl) + 1
		if states > MaxOrderStates/radix[i] {
			return nil, ErrTooConstrained
		}
		states *= radix[i]
	}
	ways, err := placements(radix, need, states)
	if err != nil {
		return nil, err
	}
	out := new(big.Int).SetUint64(ways)
	for _, cl := range classes {
		out.Mul(out, new(big.Int).MulRange(1, int64(len(cl))))
	}
	return out, nil
}

// twinClasses groups vs into classes of twins, in order of first member,
// and for each class c and each other class d the number of d's members
// that must be placed before the next member of c may be (the members of a
// class taken in their fixed sequence): need[c][d] = 1 + the largest
// position within d of a predecessor of c, or 0.
func twinClasses(vs []int, arc func(u, v int) bool) (classes [][]int, need [][]int) {
	sig := func(u int) (pred, succ []bool) {
		pred, succ = make([]bool, len(vs)), make([]bool, len(vs))
		for j, v := range vs {
			pred[j], succ[j] = arc(v, u), arc(u, v)
		}
		return pred, succ
	}
	var preds [][]bool
	classOf, pos := make([]int, len(vs)), make([]int, len(vs))
	for i, u := range vs {
		p, s := sig(u)
		c := slices.IndexFunc(classes, func(cl []int) bool {
			q, r := sig(vs[cl[0]])
			return slices.Equal(p, q) && slices.Equal(s, r)
		})
		if c < 0 {
			c = len(classes)
			classes, preds = append(classes, nil), append(preds, p)
		}
		classOf[i], pos[i] = c, len(classes[c])
		classes[c] = append(classes[c], i)
	}
	need = make([][]int, len(classes))
	for c := range classes {
		need[c] = make([]int, len(classes))
		for j, isPred := range preds[c] {
			if isPred {
				need[c][classOf[j]] = max(need[c][classOf[j]], pos[j]+1)
			}
		}
	}
	return classes, need
}

// placements runs the dynamic programme over the mixed-radix states
// (count placed of each class, class 0 the lowest digit): placing one more
// member of a class raises the state's number, so one pass in increasing
// order is enough.
func placements(radix []int, need [][]int, states int) (uint64, error) {
	ways := make([]uint64, states)
	ways[0] = 1
	count := make([]int, len(radix))
	for s := range states {
		if s > 0 {
			for d := 0; ; d++ { // advance the odometer to state s
				if count[d]++; count[d] < radix[d] {
					break
				}
				count[d] = 0
			}
		}
		if ways[s] == 0 {
			continue
		}
		stride := 1
		for c := range radix {
			if count[c]+1 < radix[c] && ready(count, need[c]) {
				var carry uint64
				ways[s+stride], carry = bits.Add64(ways[s+stride], ways[s], 0)
				if carry != 0 {
					return 0, ErrTooConstrained
				}
			}
			stride *= radix[c]
		}
	}
	return ways[states-1], nil
}

func ready(count, need []int) bool {
	for d, k := range need {
		if count[d] < k {
			return false
		}
	}
	return true
}
