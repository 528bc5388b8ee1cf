package checks

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// count writes n with the singular or plural of a noun: "1 claim",
// "2 claims".
func count(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return fmt.Sprintf("%d %s", n, many)
}

// agreement says how two estimates of a claim with the same category at
// alpha agree, true for every such pair: both significant with one sign,
// both not significant (whatever their signs), or both zero by the graph;
// and, where it is so, that the estimate changes sign or at least doubles
// or halves.
func agreement(a, b est, alpha float64) string {
	switch {
	case a.method == MethodZero && b.method == MethodZero:
		return isNoEffect(a.scale) + " by the graph either way"
	case a.method == MethodZero || b.method == MethodZero:
		return "is not significant either way (zero by the graph in one)"
	case a.category(alpha) == 0:
		return "is not significant either way" + sizeChange(a, b)
	}
	return "keeps its sign and significance" + sizeChange(a, b)
}

// estText writes an estimate to two decimals, or to two significant
// digits where two decimals would show it as 0.00 or -0.00.
func estText(v float64) string {
	if v != 0 && math.Abs(v) < 0.005 {
		return strconv.FormatFloat(v, 'g', 2, 64)
	}
	return fmt.Sprintf("%.2f", v)
}

// sizeChange notes a change of sign, or a change of size by a factor of
// two or more, between two estimates; empty otherwise.
func sizeChange(a, b est) string {
	x, y := a.additive, b.additive
	switch {
	case x*y < 0:
		return fmt.Sprintf(", though its estimate changes sign (%s to %s)", estText(a.value), estText(b.value))
	case x == 0 || y == 0:
		return ""
	case math.Abs(y/x) >= 2 || math.Abs(y/x) <= 0.5:
		return fmt.Sprintf(", though its estimate changes size by a factor of %.1f (%s to %s)",
			math.Abs(y/x), estText(a.value), estText(b.value))
	}
	return ""
}

// pText writes a p-value the way papers print it.
func pText(p float64) string {
	switch {
	case math.IsNaN(p):
		return "p not available"
	case p < 0.001:
		return "p < .001"
	}
	return "p = " + strings.TrimPrefix(fmt.Sprintf("%.3f", p), "0")
}

// noEffect names "no effect" on a claim's scale: zero, or for an odds
// ratio an odds ratio of 1.
func noEffect(scale string) string {
	if scale == "odds_ratio" {
		return "no effect (odds ratio 1)"
	}
	return "zero"
}

// isNoEffect says that an effect on the scale is none: "is zero", "is
// none, an odds ratio of 1".
func isNoEffect(scale string) string {
	if scale == "odds_ratio" {
		return "is none, an odds ratio of 1"
	}
	return "is zero"
}

// boundText writes a bound of a claim's range across graphs, naming an
// odds ratio of exactly 1 that graphs without the effect give as no effect.
func boundText(x *float64, scale string, zeros int) string {
	if x != nil && scale == "odds_ratio" && zeros > 0 && *x == zeroOnScale(scale) {
		return noEffect(scale)
	}
	return numText(x)
}

// valueText writes an estimate with its p-value, or says it is no effect
// by the graph.
func valueText(e est) string {
	if e.method == MethodZero {
		return noEffect(e.scale)
	}
	if e.isIndirect() {
		return fmt.Sprintf("%s (%s)", estText(e.value), e.judgedText())
	}
	return fmt.Sprintf("%s (%s)", estText(e.value), pText(e.p))
}
