package checks_test

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/dag"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/checks/mediation"
)

type obj = map[string]any

// tieredPackage is a summary-data package over vars with the graph's
// edges, tiers (nil: none) and claims, its correlations those the path
// model with the given coefficients implies (unit error variances).
func tieredPackage(t *testing.T, vars []string, edges [][2]string, coef []float64, tiers [][]string,
	claims []obj) *checks.Study {
	t.Helper()
	p := len(vars)
	b := mat.NewDense(p, p, nil)
	var es []obj
	for k, e := range edges {
		b.Set(slices.Index(vars, e[0]), slices.Index(vars, e[1]), coef[k])
		es = append(es, obj{"from": e[0], "to": e[1]})
	}
	psi := mat.NewSymDense(p, nil)
	for i := range p {
		psi.SetSym(i, i, 1)
	}
	cov, err := mediation.ImpliedCov(b, psi)
	if err != nil {
		t.Fatal(err)
	}
	lower := make([][]float64, p)
	for i := range p {
		for j := range i + 1 {
			lower[i] = append(lower[i], cov.At(i, j)/math.Sqrt(cov.At(i, i)*cov.At(j, j)))
		}
	}
	var vs []obj
	for _, v := range vars {
		vs = append(vs, obj{"name": v, "scale": "continuous"})
	}
	g := obj{"edges": es}
	if tiers != nil {
		g["tiers"] = tiers
	}
	doc, _ := json.Marshal(obj{"format_version": 1, "title": "t", "design": "observational", "variables": vs,
		"graph": g, "claims": claims, "data": obj{"kind": "summary", "n": 400, "variables": vars, "correlations": lower}})
	s, err := load.Load(doc, load.Options{})
	if err != nil {
		t.Fatalf("%v\n%s", err, doc)
	}
	return s
}

var mediationClaim = obj{"id": "M1", "text": "x improves y through m", "kind": "indirect_effect", "from": "x",
	"to": "y", "through": []string{"m"}, "headline": true}

// The headline "x improves y through m", in the complete graph x → m → y,
// x → y with m and y measured together after x (tiers [x], [m, y]): the
// tiers leave two plausible members, and in the one where y → m the graph
// has no directed path from x to y through m, so the indirect effect is
// zero there; the report counts it, names the reversed arrow and says so
// in words, and the equivalence check fails the headline claim.
func TestIndirect_ZeroWhereMediatorAndOutcomeSwap(t *testing.T) {
	s := tieredPackage(t, []string{"x", "m", "y"}, [][2]string{{"x", "m"}, {"m", "y"}, {"x", "y"}},
		[]float64{0.5, 0.4, 0.2}, [][]string{{"x"}, {"m", "y"}}, []obj{mediationClaim})
	rep := mustRun(t, s)
	c := claimByID(rep, "M1")
	ae := c.AcrossEquivalents
	if ae == nil || ae.Estimates != 2 || ae.Differing != 1 || ae.Min == nil || *ae.Min != 0 {
		t.Fatalf("across equivalents: %+v", ae)
	}
	if ae.Contrast == nil || ae.Contrast.Estimate.Method != checks.MethodZero ||
		!slices.Equal(ae.Contrast.ReversedArrows, [][2]string{{"y", "m"}}) {
		t.Fatalf("contrast: %+v", ae.Contrast)
	}
	eq := checkByID(t, rep, "equivalence")
	if eq.Status != checks.StatusFail {
		t.Errorf("equivalence %s, want fail", eq.Status)
	}
	text := findingsText(eq)
	for _, want := range []string{
		"zero, with no directed path from x to y through m, in 1 of the 2 plausible members",
		"for instance if y → m",
		"leave 1 edge open: m — y (within tier 2)",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("equivalence findings lack %q:\n%s", want, text)
		}
	}
	if got := rep.Graph.PlausibleClassSize; got != int64(2) {
		t.Errorf("plausible class %v, want 2", got)
	}
}

// rho_at_zero of a single-mediator claim with no covariates is the
// partial correlation of m and y given x (Imai, Keele & Yamamoto 2010,
// sec. 5: ρ̃ = corr(ε₁, ε₂), the residuals of m and y on x), by the
// textbook formula r_my·x = (r_my − r_mx r_yx)/√((1 − r_mx²)(1 − r_yx²)),
// to 1e-9; the confounding check words it.
func TestIndirect_RhoAtZeroInTheReport(t *testing.T) {
	s := tieredPackage(t, []string{"x", "m", "y"}, [][2]string{{"x", "m"}, {"m", "y"}, {"x", "y"}},
		[]float64{0.5, 0.4, 0.2}, nil, []obj{mediationClaim})
	rep := mustRun(t, s)
	r := s.Data.Cor
	rmx, rxy, rmy := r.At(1, 0), r.At(2, 0), r.At(2, 1)
	want := (rmy - rmx*rxy) / math.Sqrt((1-rmx*rmx)*(1-rxy*rxy))
	mc := claimByID(rep, "M1").MediatorConfounding
	if mc == nil || mc.RhoAtZero == nil || !scalar.EqualWithinAbsOrRel(*mc.RhoAtZero, want, 1e-9, 1e-9) {
		t.Fatalf("mediator_confounding %+v, want rho_at_zero %v", mc, want)
	}
	text := findingsText(checkByID(t, rep, "confounding-sensitivity"))
	if !strings.Contains(text, "correlated their errors by "+strings.TrimSpace(fmtEst(want))) {
		t.Errorf("the confounding check does not give %v in words:\n%s", want, text)
	}
}

func fmtEst(x float64) string {
	b, _ := json.Marshal(math.Round(x*100) / 100)
	return string(b)
}

func checkByID(t *testing.T, r *checks.Report, id string) checks.CheckResult {
	t.Helper()
	for _, c := range r.Checks {
		if c.ID == id {
			return c
		}
	}
	t.Fatalf("no check %s", id)
	return checks.CheckResult{}
}

func findingsText(c checks.CheckResult) string {
	var b strings.Builder
	for _, f := range c.Findings {
		b.WriteString(f.Message + "\n")
	}
	return b.String()
}

// threeWave is a cross-lagged panel over three waves with a variable in
// no tier: z (say, the school) → x1; wave 1 x1 → m1; wave 2 x2, m2; wave 3
// y3; arrows within and across waves.
var threeWave = struct {
	vars  []string
	edges [][2]string
	tiers [][]string
}{
	[]string{"z", "x1", "m1", "x2", "m2", "y3"},
	[][2]string{{"z", "x1"}, {"x1", "m1"}, {"x1", "x2"}, {"m1", "m2"}, {"x1", "m2"}, {"x2", "m2"},
		{"x2", "y3"}, {"m2", "y3"}, {"m1", "y3"}},
	[][]string{{"x1", "m1"}, {"x2", "m2"}, {"y3"}},
}

// Tier-aware equivalence counts on a three-wave package against brute
// force: every orientation of the declared skeleton that is acyclic, has
// the declared graph's v-structures (Markov equivalence, Verma & Pearl
// 1990) and points no arrow from a later tier to an earlier one. The
// report's plausible class size and its plausible members are exactly
// those, and with the tiers dropped the count is the whole class's.
func TestEquivalence_TieredCountsAgainstBruteForce(t *testing.T) {
	r := rand.New(rand.NewPCG(18, 3))
	coef := make([]float64, len(threeWave.edges))
	for k := range coef {
		coef[k] = 0.2 + 0.3*r.Float64()
	}
	for _, tiers := range [][][]string{threeWave.tiers, nil} {
		s := tieredPackage(t, threeWave.vars, threeWave.edges, coef, tiers, []obj{{"id": "C1",
			"text": "x1 affects y3 through x2", "kind": "indirect_effect", "from": "x1", "to": "y3",
			"through": []string{"x2"}}})
		rep := mustRun(t, s)
		want := bruteTiered(threeWave.vars, threeWave.edges, tiers)
		if got := rep.Graph.PlausibleClassSize; got != int64(len(want)) {
			t.Errorf("tiers %v: plausible class %v, brute force %d", tiers, got, len(want))
		}
		var listed []string
		for _, m := range rep.Graph.PlausibleDAGs {
			listed = append(listed, arcKey(m))
		}
		slices.Sort(listed)
		if !slices.Equal(listed, want) {
			t.Errorf("tiers %v: plausible members\n%v\nbrute force\n%v", tiers, listed, want)
		}
	}
}

// bruteTiered lists, as sorted arc keys, the Markov equivalents of the
// graph that respect the tiers.
func bruteTiered(vars []string, edges [][2]string, tiers [][]string) []string {
	tierOf := map[string]int{}
	for k, tier := range tiers {
		for _, v := range tier {
			tierOf[v] = k + 1
		}
	}
	idx := func(v string) int { return slices.Index(vars, v) }
	build := func(arcs [][2]string) *dag.PDAG {
		var es []dag.Edge
		for _, a := range arcs {
			es = append(es, dag.Edge{From: idx(a[0]), To: idx(a[1])})
		}
		return dag.FromArcs(len(vars), es)
	}
	want := vstructures(build(edges))
	var out []string
	for mask := range 1 << len(edges) {
		arcs := make([][2]string, len(edges))
		ok := true
		for k, e := range edges {
			arcs[k] = e
			if mask&(1<<k) != 0 {
				arcs[k] = [2]string{e[1], e[0]}
			}
			a, b := tierOf[arcs[k][0]], tierOf[arcs[k][1]]
			ok = ok && !(a > 0 && b > 0 && a > b)
		}
		g := build(arcs)
		if ok && dag.FindCycle(g) == nil && vstructures(g) == want {
			out = append(out, arcKey(arcs))
		}
	}
	slices.Sort(out)
	return out
}

// vstructures lists the graph's unshielded colliders a → c ← b.
func vstructures(g *dag.PDAG) string {
	var vs []string
	for c := range g.N() {
		pa := g.Parents(c)
		for i, a := range pa {
			for _, b := range pa[i+1:] {
				if !g.Adjacent(a, b) {
					vs = append(vs, strings.Join([]string{itoa(a), itoa(c), itoa(b)}, ">"))
				}
			}
		}
	}
	slices.Sort(vs)
	return strings.Join(vs, ",")
}

func itoa(i int) string { b, _ := json.Marshal(i); return string(b) }

func arcKey(arcs [][2]string) string {
	var parts []string
	for _, a := range arcs {
		parts = append(parts, a[0]+">"+a[1])
	}
	slices.Sort(parts)
	return strings.Join(parts, " ")
}
