package load

import (
	"bytes"
	"fmt"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/dag"
)

// Limits bound what one package may hold (package-format.md, "Limits").
type Limits struct {
	PackageBytes int64 // the package JSON
	CSVBytes     int64 // the CSV data
	Rows         int   // data rows
	Variables    int
	Edges        int // per graph
	Claims       int
	Alternatives int
}

// DefaultLimits are the limits of package-format.md.
var DefaultLimits = Limits{
	PackageBytes: 5 << 20,
	CSVBytes:     100 << 20,
	Rows:         2_000_000,
	Variables:    500,
	Edges:        5_000,
	Claims:       200,
	Alternatives: 50,
}

// Options say where a package's CSV data come from and which limits
// apply.
type Options struct {
	Limits Limits
	// ReadFile reads data.file, relative to the package (the CLI). Nil
	// where files cannot be read (the API).
	ReadFile func(name string) ([]byte, error)
	// CSV is data sent beside the package (the API's multipart part
	// "data"); it stands in for data.file.
	CSV []byte
}

// study is the study being built; the loader's methods fill it in.
type study struct{ *checks.Study }

// Load decodes and checks a package document and its data, and returns
// the resolved study, or an *InvalidPackageError that lists every problem
// found, each with its JSON pointer or CSV line and column.
func Load(doc []byte, opt Options) (*checks.Study, error) {
	lim := opt.Limits
	if lim == (Limits{}) {
		lim = DefaultLimits
	}
	if int64(len(doc)) > lim.PackageBytes {
		return nil, &checks.InvalidPackageError{TooLarge: true, Problems: []checks.Problem{{
			Detail: fmt.Sprintf("the package is %d bytes; the limit is %d", len(doc), lim.PackageBytes)}}}
	}
	doc = bytes.TrimPrefix(doc, utf8BOM)
	var ps problems
	pkg, ok := decodePackage(doc, lim, &ps)
	if !ok || ps.full() {
		return nil, ps.err()
	}
	s := newStudy(doc, pkg, &ps)
	var csvText []byte
	if !ps.full() && !ps.coveredBelow("/data", "/data/kind") {
		csvText = s.resolveData(opt, lim, &ps)
	}
	if err := ps.err(); err != nil {
		return nil, err
	}
	s.SHA256 = canonicalHash(pkg, csvText)
	return s.Study, nil
}

// decodePackage decodes doc, counting its lists against the limits, and
// checks its fields; it reports false when the problems found leave
// nothing further to check.
func decodePackage(doc []byte, lim Limits, ps *problems) (*checks.Package, bool) {
	pkg := new(checks.Package)
	if !decode(doc, pkg, lim, ps) {
		return nil, false
	}
	checkFields(pkg, ps)
	ps.shadow()
	return pkg, true
}

// newStudy indexes the variables of pkg and resolves its graphs and claims.
func newStudy(doc []byte, pkg *checks.Package, ps *problems) *study {
	s := &study{&checks.Study{
		Package: pkg,
		Index:   indexVariables(pkg, ps),
		Printed: printedClaims(doc, len(pkg.Claims)),
	}}
	for _, v := range pkg.Variables {
		s.Names = append(s.Names, v.Name)
	}
	s.resolveGraphs(ps)
	checkClaims(pkg, s.Index, ps)
	s.checkIndirectPaths(ps)
	return s
}

// resolveGraphs checks the declared graph and the alternatives and builds
// their DAGs and the background knowledge.
func (s *study) resolveGraphs(ps *problems) {
	pkg, n := s.Package, len(s.Names)
	tiers := s.resolveTiers(ps)
	if g := pkg.Graph; g != nil {
		edges := graphEdges("/graph/edges", g.Edges, s.Index, ps)
		checkExogenous("/graph/edges", pkg, g.Edges, s.Index, ps)
		s.checkTierOrder("/graph/edges", edges, tiers, ps)
		if edges != nil {
			s.Declared = acyclicGraph("/graph/edges", n, edges, s.Names, ps)
			s.InGraph = make([]bool, n)
			for _, e := range edges {
				s.InGraph[e.From], s.InGraph[e.To] = true, true
			}
		}
		fixed := graphEdges("/graph/fixed_edges", g.FixedEdges, s.Index, ps)
		if s.Declared != nil && fixed != nil {
			s.background(fixed, ps)
		}
		if s.Declared != nil && tiers != nil {
			s.Tiers = tiers
			arcs, _ := dag.TierArcs(dag.CPDAG(s.Declared), tiers) // tiers checked by resolveTiers
			s.Background = append(s.Background, arcs...)
		}
	}
	names := map[string]int{}
	for i, a := range pkg.Alternatives {
		base := pointer("alternatives", i)
		if j, dup := names[a.Name]; dup {
			ps.at(base+"/name", "%s is already the name of /alternatives/%d", quoted(a.Name), j)
		}
		names[a.Name] = i
		checkExogenous(base+"/edges", pkg, a.Edges, s.Index, ps)
		if edges := graphEdges(base+"/edges", a.Edges, s.Index, ps); edges != nil {
			s.checkTierOrder(base+"/edges", edges, tiers, ps)
			s.Alternatives = append(s.Alternatives, acyclicGraph(base+"/edges", n, edges, s.Names, ps))
		}
	}
}

// fixedNotEdge reports a fixed edge (from, to) missing from the graph.
const fixedNotEdge = "%s → %s is not an edge of /graph/edges"

// background collects the required arcs and checks that each fixed edge
// is an edge of the declared graph.
func (s *study) background(fixed []dag.Edge, ps *problems) {
	for i, e := range fixed {
		if !s.Declared.HasArc(e.From, e.To) {
			ps.at(pointer("graph", "fixed_edges", i), fixedNotEdge, s.Names[e.From], s.Names[e.To])
			continue
		}
		s.Background = append(s.Background, e)
	}
	for i, v := range s.Package.Variables {
		if v.Exogenous && s.InGraph[i] {
			s.Background = append(s.Background, dag.ExogenousArcs(s.Declared, i)...)
		}
	}
}
