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
		"graph": g, "claims": claims,
		"data": obj{"kind": "summary", "n": 400, "variables": vars, "correlations": lower}})
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

// pkgWith is tieredPackage with the variables' scales and n changed.
func pkgWith(t *testing.T, vars []string, edges [][2]string, coef []float64, claims []obj, binary string,
	n int) *checks.Study {
	t.Helper()
	s := tieredPackage(t, vars, edges, coef, nil, claims)
	var doc obj
	b, _ := json.Marshal(s.Package)
	_ = json.Unmarshal(b, &doc)
	for _, v := range doc["variables"].([]any) {
		if v.(map[string]any)["name"] == binary {
			v.(map[string]any)["scale"] = "binary"
		}
	}
	d := doc["data"].(map[string]any)
	d["n"] = n
	lower := make([][]float64, len(vars))
	for i := range vars {
		for j := range i + 1 {
			lower[i] = append(lower[i], s.Data.Cor.At(i, j))
		}
	}
	d["correlations"] = lower
	out, _ := json.Marshal(doc)
	st, err := load.Load(out, load.Options{})
	if err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	return st
}

func indirectClaim(id string, from, to string, through []string, extra obj) obj {
	c := obj{"id": id, "text": "an indirect effect", "kind": "indirect_effect", "from": from, "to": to,
		"through": through}
	for k, v := range extra {
		c[k] = v
	}
	return c
}

var triangle = struct {
	vars  []string
	edges [][2]string
}{[]string{"x", "m", "y"}, [][2]string{{"x", "m"}, {"m", "y"}, {"x", "y"}}}

// The mediator–outcome error correlation is given only where its closed
// form holds, and each other case says why in the confounding check, as a
// warning: two mediators, a binary mediator, a covariate the exposure
// affects in the mediator's or the outcome's equation.
func TestIndirect_RhoNotComputedSaysWhy(t *testing.T) {
	cases := []struct {
		name   string
		s      *checks.Study
		reason string
	}{
		{"two mediators", pkgWith(t, []string{"x", "m1", "m2", "y"},
			[][2]string{{"x", "m1"}, {"m1", "m2"}, {"m2", "y"}, {"x", "y"}}, []float64{.5, .5, .5, .1},
			[]obj{indirectClaim("M", "x", "y", []string{"m1", "m2"}, nil)}, "", 400),
			"the closed form is for a claim through one mediator"},
		{"binary mediator", pkgWith(t, triangle.vars, triangle.edges, []float64{.5, .4, .2},
			[]obj{indirectClaim("M", "x", "y", []string{"m"}, nil)}, "m", 400),
			"m is binary, and the closed form is for a continuous mediator and outcome"},
		{"post-exposure covariate", pkgWith(t, []string{"x", "w", "m", "y"},
			[][2]string{{"x", "w"}, {"w", "m"}, {"x", "m"}, {"m", "y"}, {"w", "y"}}, []float64{.5, .3, .4, .4, .2},
			[]obj{indirectClaim("M", "x", "y", []string{"m"}, nil)}, "", 400),
			"the equations of m and y hold w, which x affects, so the single-mediator model does not apply"},
	}
	for _, tc := range cases {
		rep := mustRun(t, tc.s)
		if mc := claimByID(rep, "M").MediatorConfounding; mc != nil {
			t.Errorf("%s: mediator_confounding %+v", tc.name, mc)
		}
		c := checkByID(t, rep, "confounding-sensitivity")
		if c.Status != checks.StatusWarn || !strings.Contains(findingsText(c), tc.reason) ||
			!strings.Contains(c.Summary, "M has no figure for confounding of its mediator and outcome") {
			t.Errorf("%s: %s, %q\n%s", tc.name, c.Status, c.Summary, findingsText(c))
		}
	}
}

// The proportion mediated is given only when the total effect is
// significant with the indirect effect's sign, and is then indirect /
// total; a total effect near zero (a direct effect against the indirect
// one) or of the other sign is said instead.
func TestIndirect_ProportionMediatedOnlyWithASignificantTotalOfTheSameSign(t *testing.T) {
	cases := []struct {
		name  string
		coef  []float64 // x → m, m → y, x → y
		given bool
		says  string
	}{
		{"same sign", []float64{.5, .4, .2}, true, "of the total effect of x on y"},
		{"total near zero", []float64{.5, .4, -.2}, false, "the total effect of x on y is not significant"},
		{"other sign", []float64{.5, .4, -.6}, false, "significant with the other sign than the indirect effect"},
	}
	for _, tc := range cases {
		s := pkgWith(t, triangle.vars, triangle.edges, tc.coef, []obj{indirectClaim("M", "x", "y", []string{"m"}, nil)},
			"", 400)
		rep := mustRun(t, s)
		c := claimByID(rep, "M")
		if (c.ProportionMediated != nil) != tc.given {
			t.Errorf("%s: proportion %+v", tc.name, c.ProportionMediated)
		}
		if pm := c.ProportionMediated; pm != nil {
			want := *c.Declared.Estimate / *pm.TotalEffect.Estimate
			if !scalar.EqualWithinAbsOrRel(*pm.Proportion, want, 1e-8, 1e-8) {
				t.Errorf("%s: proportion %v, indirect / total %v", tc.name, *pm.Proportion, want)
			}
		}
		if text := findingsText(checkByID(t, rep, "effect-reporting")); !strings.Contains(text, tc.says) {
			t.Errorf("%s: effect-reporting lacks %q:\n%s", tc.name, tc.says, text)
		}
	}
}

// A claim of no indirect effect is weighed by its intervals: an effect
// found where the judging interval excludes zero, meaningful effects
// excluded where the 90% interval lies within ±0.1, else the data do not
// tell.
func TestIndirect_AbsenceByIntervals(t *testing.T) {
	cases := []struct {
		name    string
		coef    []float64
		n       int
		verdict string
	}{
		{"none", []float64{0, .3, .3}, 2000, "excludes_meaningful_effects"},
		{"an effect", []float64{.5, .4, .2}, 400, "effect_found"},
		{"too few cases", []float64{.25, .25, .2}, 40, "does_not_tell"},
	}
	for _, tc := range cases {
		s := pkgWith(t, triangle.vars, triangle.edges, tc.coef,
			[]obj{indirectClaim("M", "x", "y", []string{"m"}, obj{"asserts_absence": true})}, "", tc.n)
		rep := mustRun(t, s)
		at := claimByID(rep, "M").Absence
		if at == nil || at.Verdict != tc.verdict || at.Distribution != checks.IntervalMonteCarlo || at.TOSTP != nil {
			t.Errorf("%s: absence test %+v, want %s by the Monte Carlo interval", tc.name, at, tc.verdict)
		}
	}
}

// A reported p-value of an indirect effect gets the warning about
// normal-theory tests (Preacher & Hayes 2008); an interval symmetric to
// its printed digits gets it as a note; an asymmetric one gets nothing.
func TestIndirect_SkewNote(t *testing.T) {
	cases := []struct {
		name     string
		reported obj
		severity string
	}{
		{"p-value", obj{"estimate": 0.2, "std_error": 0.04, "p_value": 0.001, "p_relation": "<"}, checks.StatusWarn},
		{"symmetric", obj{"estimate": 0.2, "ci": []float64{0.12, 0.28}}, checks.SeverityInfo},
		{"asymmetric", obj{"estimate": 0.21, "ci": []float64{0.14, 0.33}}, ""},
	}
	for _, tc := range cases {
		s := pkgWith(t, triangle.vars, triangle.edges, []float64{.5, .4, .2},
			[]obj{indirectClaim("M", "x", "y", []string{"m"}, tc.reported)}, "", 400)
		sev := ""
		er := checkByID(t, mustRun(t, s), "effect-reporting")
		for _, f := range er.Findings {
			if strings.Contains(f.Message, "Preacher & Hayes 2008") {
				sev = f.Severity
			}
		}
		if sev != tc.severity {
			t.Errorf("%s: note %q, want %q", tc.name, sev, tc.severity)
		}
		if want := "The indirect effect M is reported with a normal-theory p-value"; (tc.severity == checks.StatusWarn) !=
			strings.HasPrefix(er.Summary, want) {
			t.Errorf("%s: summary %q", tc.name, er.Summary)
		}
	}
}

// Past the 2,000 members listed for re-estimation an indirect effect,
// which needs whole graphs, is not re-estimated across the class, and the
// equivalence check says so as a warning: here a complete graph on seven
// variables, 5,040 members, every one plausible.
func TestIndirect_NotComputedPastTheListingLimit(t *testing.T) {
	vars := []string{"x", "m", "y", "a", "b", "c", "d"}
	var edges [][2]string
	var coef []float64
	for i := range vars {
		for j := i + 1; j < len(vars); j++ {
			edges, coef = append(edges, [2]string{vars[i], vars[j]}), append(coef, 0.1+0.02*float64(j))
		}
	}
	s := pkgWith(t, vars, edges, coef, []obj{indirectClaim("M", "x", "y", []string{"m"}, nil)}, "", 400)
	rep := mustRun(t, s)
	ae := claimByID(rep, "M").AcrossEquivalents
	if ae == nil || !strings.Contains(ae.NotComputed, "the class has 5040 plausible members") || ae.Estimates != 0 {
		t.Fatalf("across equivalents %+v", ae)
	}
	c := checkByID(t, rep, "equivalence")
	if c.Status != checks.StatusWarn || !strings.Contains(findingsText(c),
		"M could not be re-estimated across the equivalent graphs: the class has 5040 plausible members") {
		t.Errorf("%s\n%s", c.Status, findingsText(c))
	}
}

// Without a declared graph an indirect claim cannot be estimated (its
// effect is a sum over a graph's paths), says so, and fails graph-declared
// as every causal claim without a graph does.
func TestIndirect_NoGraph(t *testing.T) {
	s := tieredPackage(t, triangle.vars, triangle.edges, []float64{.5, .4, .2}, nil,
		[]obj{indirectClaim("M", "x", "y", []string{"m"}, nil)})
	s.Package.Graph, s.Declared, s.InGraph = nil, nil, nil
	rep := mustRun(t, s)
	if d := claimByID(rep, "M").Declared; d == nil || !strings.Contains(d.Error, "in no declared graph") {
		t.Errorf("declared %+v", d)
	}
	if c := checkByID(t, rep, "graph-declared"); c.Status != checks.StatusFail {
		t.Errorf("graph-declared %s", c.Status)
	}
}

// Tiers that orient every arrow are said to leave no line open.
func TestTiers_EveryArrowOriented(t *testing.T) {
	s := tieredPackage(t, triangle.vars, triangle.edges, []float64{.5, .4, .2}, [][]string{{"x"}, {"m"}, {"y"}},
		[]obj{mediationClaim})
	rep := mustRun(t, s)
	if text := findingsText(checkByID(t, rep, "equivalence")); !strings.Contains(text,
		"it orients every arrow of the declared graph: no line is left open") {
		t.Errorf("%s", text)
	}
	if ae := claimByID(rep, "M1").AcrossEquivalents; ae == nil || ae.Estimates != 1 || ae.Unstable {
		t.Errorf("across equivalents %+v", ae)
	}
}
