package load

import (
	"bytes"
	"fmt"
	"reflect"
	"regexp"
	"strings"
	"sync"

	"github.com/go-playground/validator/v10"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/dag"
)

var (
	varNameRE = regexp.MustCompile(`^[A-Za-z][A-Za-z0-9_]{0,63}$`)
	claimIDRE = regexp.MustCompile(`^[A-Za-z0-9_.-]{1,32}$`)
	indexRE   = regexp.MustCompile(`\[(\d+)\]`)
)

// fieldRules is the validator for the tags in package.go, built once.
var fieldRules = sync.OnceValue(func() *validator.Validate {
	v := validator.New(validator.WithRequiredStructEnabled())
	v.RegisterTagNameFunc(jsonName)
	must := func(tag string, re *regexp.Regexp) {
		if err := v.RegisterValidation(tag, func(fl validator.FieldLevel) bool {
			return re.MatchString(fl.Field().String())
		}); err != nil {
			panic(err)
		}
	}
	must("varname", varNameRE)
	must("claimid", claimIDRE)
	return v
})

// checkFields runs the validator and turns each failure into a Problem
// with the field's JSON pointer. The edges, which may number a quarter of
// a million, are validated one by one, and no longer once the list of
// problems is full, so that a package of empty edges does not make a
// quarter of a million validation errors at once.
func checkFields(pkg *checks.Package, ps *problems) {
	isEdge := []byte("Edges[")
	reportFields("", fieldRules().StructFiltered(pkg, func(ns []byte) bool { return bytes.Contains(ns, isEdge) }), ps)
	if g := pkg.Graph; g != nil {
		checkEdgeFields("/graph/edges", g.Edges, ps)
		checkEdgeFields("/graph/fixed_edges", g.FixedEdges, ps)
	}
	for i, a := range pkg.Alternatives {
		checkEdgeFields(pointer("alternatives", i, "edges"), a.Edges, ps)
	}
}

func checkEdgeFields(base string, edges []checks.Edge, ps *problems) {
	for i := range edges {
		if ps.full() {
			return
		}
		reportFields(base+pointer(i), fieldRules().Struct(&edges[i]), ps)
	}
}

// reportFields reports the validator's failures; base is the pointer of
// the struct it validated.
func reportFields(base string, err error, ps *problems) {
	if err == nil {
		return
	}
	errs, ok := err.(validator.ValidationErrors)
	if !ok {
		ps.at(base, "%v", err)
		return
	}
	for _, fe := range errs {
		ps.at(base+namespacePointer(fe.Namespace()), "%s", ruleText(fe))
	}
}

// namespacePointer turns "Package.claims[2].to" into "/claims/2/to".
func namespacePointer(ns string) string {
	_, rest, _ := strings.Cut(ns, ".")
	rest = indexRE.ReplaceAllString(rest, ".$1")
	return "/" + strings.ReplaceAll(rest, ".", "/")
}

// ruleText says in words which rule fe breaks.
func ruleText(fe validator.FieldError) string {
	if hint := proportionHint(fe); hint != "" {
		return hint
	}
	p := fe.Param()
	switch fe.Tag() {
	case "required":
		return "is required"
	case "min", "max":
		return boundText(fe)
	case "oneof":
		hint := didYouMean(clipped(fmt.Sprint(fe.Value())), strings.Fields(p))
		return "must be one of: " + strings.ReplaceAll(p, " ", ", ") + hint
	case "lte":
		if fe.Field() == "n" {
			return "must be at most " + p + ", the format's limit on the sample size"
		}
	case "varname":
		return "must match " + varNameRE.String()
	case "claimid":
		return "must match " + claimIDRE.String()
	}
	if format, ok := ruleFormats[fe.Tag()]; ok {
		return fmt.Sprintf(format, p)
	}
	return "fails the rule " + fe.Tag()
}

// ruleFormats word the rules whose text only needs the rule's parameter.
var ruleFormats = map[string]string{
	"eq":  "must be %s",
	"len": "must have exactly %s entries",
	"gt":  "must be greater than %s",
	"gte": "must be at least %s",
	"lt":  "must be less than %s",
	"lte": "must be at most %s",
}

// noClaims is the text of an empty claims section.
const noClaims = "has no claims yet: add each claim the paper makes, with its id, text, kind, from and to"

// boundText words a min or max rule: on a count of entries, on the length
// of a string, or on a number.
func boundText(fe validator.FieldError) string {
	if fe.Namespace() == "Package.claims" && fe.Tag() == "min" {
		return noClaims
	}
	bound := map[string]string{"min": "at least", "max": "at most"}[fe.Tag()]
	switch fe.Kind() {
	case reflect.Slice, reflect.Map:
		return fmt.Sprintf("must have %s %s entries", bound, fe.Param())
	case reflect.String:
		return fmt.Sprintf("must be %s %s characters long", bound, fe.Param())
	}
	return fmt.Sprintf("must be %s %s", bound, fe.Param())
}

// proportionHint explains a level written as a percentage: ci_level 95
// is 0.95.
func proportionHint(fe validator.FieldError) string {
	v := reflect.Indirect(reflect.ValueOf(fe.Value()))
	if fe.Field() != "ci_level" || !v.CanFloat() {
		return ""
	}
	if x := v.Float(); x > 1 && x <= 100 {
		return fmt.Sprintf("is %g, but the level is a proportion: write %g", x, x/100)
	}
	return ""
}

// indexVariables maps names to positions and reports duplicates.
func indexVariables(pkg *checks.Package, ps *problems) map[string]int {
	index := map[string]int{}
	for i, v := range pkg.Variables {
		if j, dup := index[v.Name]; dup {
			ps.at(pointer("variables", i, "name"), "%s is already the name of /variables/%d", quoted(v.Name), j)
			continue
		}
		index[v.Name] = i
	}
	return index
}

// graphEdges resolves a list of named edges: names declared, no
// self-loops, no duplicates. It returns nil when any edge is bad.
func graphEdges(base string, edges []checks.Edge, index map[string]int, ps *problems) []dag.Edge {
	out := make([]dag.Edge, 0, len(edges))
	seen := map[[2]int]int{}
	bad := false
	for i, e := range edges {
		at := pointer(i)
		from, okF := index[e.From]
		to, okT := index[e.To]
		if !okF {
			ps.unknown(base+at+"/from", e.From, index)
		}
		if !okT {
			ps.unknown(base+at+"/to", e.To, index)
		}
		switch {
		case !okF || !okT:
		case from == to:
			ps.at(base+at, "is a self-loop on %s", quoted(e.From))
		default:
			if j, dup := seen[[2]int{from, to}]; dup {
				ps.at(base+at, "repeats %s%s", base, pointer(j))
			} else if _, back := seen[[2]int{to, from}]; back {
				ps.at(base, "has a cycle: %s → %s → %s", e.From, e.To, e.From)
			} else {
				seen[[2]int{from, to}] = i
				out = append(out, dag.Edge{From: from, To: to})
				continue
			}
		}
		bad = true
	}
	if bad {
		return nil
	}
	return out
}

// acyclicGraph builds the DAG of the edges and reports a cycle, naming its
// nodes in order.
func acyclicGraph(base string, n int, edges []dag.Edge, names []string, ps *problems) *dag.PDAG {
	g := dag.FromArcs(n, edges)
	if cyc := dag.FindCycle(g); cyc != nil {
		parts := make([]string, 0, len(cyc)+1)
		for _, v := range append(cyc, cyc[0]) {
			parts = append(parts, names[v])
		}
		ps.at(base, "has a cycle: %s", strings.Join(parts, " → "))
		return nil
	}
	return g
}

// checkExogenous reports every edge that points into an exogenous variable.
func checkExogenous(base string, pkg *checks.Package, edges []checks.Edge, index map[string]int, ps *problems) {
	for i, e := range edges {
		if j, ok := index[e.To]; ok && pkg.Variables[j].Exogenous {
			ps.at(base+pointer(i, "to"), "points into %s, which /variables/%d declares exogenous", quoted(e.To), j)
		}
	}
}

// checkClaims checks the claims' ids and the variables they name.
func checkClaims(pkg *checks.Package, index map[string]int, ps *problems) {
	ids := map[string]int{}
	for i, c := range pkg.Claims {
		at := pointer("claims", i)
		if j, dup := ids[c.ID]; dup && c.ID != "" {
			ps.at(at+"/id", "%s is already the id of /claims/%d", quoted(c.ID), j)
		}
		ids[c.ID] = i
		for _, f := range []struct{ name, value string }{{"from", c.From}, {"to", c.To}} {
			if _, ok := index[f.value]; !ok && f.value != "" {
				ps.unknown(at+"/"+f.name, f.value, index)
			}
		}
		if c.From == c.To && c.From != "" {
			ps.at(at+"/to", "is the same variable as from")
		}
		checkAdjustFor(at, c, index, ps)
		checkThrough(at, c, index, ps)
		checkReported(at, c, ps)
	}
}

func checkAdjustFor(at string, c checks.Claim, index map[string]int, ps *problems) {
	seen := map[string]bool{}
	for k, a := range c.AdjustFor {
		p := at + pointer("adjust_for", k)
		switch _, ok := index[a]; {
		case !ok:
			ps.unknown(p, a, index)
		case a == c.From || a == c.To:
			ps.at(p, "%s is the claim's own from or to variable", quoted(a))
		case seen[a]:
			ps.at(p, "%s is listed twice", quoted(a))
		}
		seen[a] = true
	}
}

func checkReported(at string, c checks.Claim, ps *problems) {
	if len(c.CI) == 2 && c.CI[0] > c.CI[1] {
		ps.at(at+"/ci", "lower limit %g is above upper limit %g", c.CI[0], c.CI[1])
	}
	if c.EstimateScale == "odds_ratio" {
		if c.Estimate != nil && *c.Estimate <= 0 {
			ps.at(at+"/estimate", "an odds ratio must be positive")
		}
		if len(c.CI) == 2 && c.CI[0] <= 0 {
			ps.at(at+"/ci", "an odds ratio's interval must be positive")
		}
	}
	if c.Estimate != nil && len(c.CI) == 2 && (*c.Estimate < c.CI[0] || *c.Estimate > c.CI[1]) {
		ps.at(at+"/estimate", "%g lies outside its own interval [%g, %g]", *c.Estimate, c.CI[0], c.CI[1])
	}
}
