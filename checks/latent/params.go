package latent

import "fmt"

// ParamKind says what a free parameter is.
type ParamKind int

const (
	// Loading is the loading of indicator To on latent node From (the
	// markers' loadings are fixed at 1 and are no parameters).
	Loading ParamKind = iota
	// Path is the coefficient of structural node From in To's equation.
	Path
	// Variance (To = From) is an indicator's residual variance, an
	// endogenous structural node's disturbance variance or a source's
	// variance.
	Variance
	// Covariance is a residual covariance of two indicators or the
	// covariance of two sources (structural nodes without parents).
	Covariance
)

func (k ParamKind) String() string {
	return [...]string{"loading", "path", "variance", "covariance"}[k]
}

// Param is one free parameter; To and From are nodes (Spec).
type Param struct {
	Kind     ParamKind
	To, From int
}

func (p Param) String() string {
	switch p.Kind {
	case Variance:
		return fmt.Sprintf("variance of node %d", p.To)
	case Covariance:
		return fmt.Sprintf("covariance of nodes %d and %d", p.To, p.From)
	}
	return fmt.Sprintf("%s %d → %d", p.Kind, p.From, p.To)
}

// inA reports whether the parameter is an entry of the coefficient matrix
// A (loadings and paths) rather than of the covariance matrix P.
func (p Param) inA() bool { return p.Kind == Loading || p.Kind == Path }

// layout is a validated Spec with its free parameters in a fixed order:
// the loadings latent by latent (non-markers in the Spec's order), the
// paths node by node (parents in the declared order), one variance per
// node in node order, the residual covariances in the Spec's order, and
// the covariances of the sources, pair by pair in node order.
type layout struct {
	spec    Spec
	roles   *roles
	p, m    int
	params  []Param
	sources []int // structural nodes without parents
}

// Parameters returns the free parameters of spec in the order Fit uses
// for Options.Start and Result.Params.
func Parameters(spec Spec) ([]Param, error) {
	l, err := newLayout(spec)
	if err != nil {
		return nil, err
	}
	return l.params, nil
}

func newLayout(spec Spec) (*layout, error) {
	r, err := spec.validate()
	if err != nil {
		return nil, err
	}
	l := &layout{spec: spec, roles: r, p: spec.Observed, m: spec.Nodes()}
	l.addCoefficients()
	for v := range l.m {
		l.params = append(l.params, Param{Variance, v, v})
		if r.structural[v] && len(spec.parentsOf(v)) == 0 {
			l.sources = append(l.sources, v)
		}
	}
	for _, pr := range spec.ResidualCovariances {
		l.params = append(l.params, Param{Covariance, max(pr[0], pr[1]), min(pr[0], pr[1])})
	}
	l.addSourceCovariances()
	return l, nil
}

// addCoefficients lists the loadings of the non-markers, then the paths.
func (l *layout) addCoefficients() {
	for j, items := range l.spec.Indicators {
		for _, v := range items[1:] {
			l.params = append(l.params, Param{Loading, v, l.spec.Latent(j)})
		}
	}
	for v := range l.m {
		for _, u := range l.spec.parentsOf(v) {
			l.params = append(l.params, Param{Path, v, u})
		}
	}
}

func (l *layout) addSourceCovariances() {
	if l.spec.IndependentSources {
		return
	}
	for i, u := range l.sources {
		for _, w := range l.sources[i+1:] {
			l.params = append(l.params, Param{Covariance, w, u})
		}
	}
}

// df is p(p + 1)/2 − q.
func (l *layout) df() int { return l.p*(l.p+1)/2 - len(l.params) }

// marker returns the marker indicator of latent j.
func (l *layout) marker(j int) int { return l.spec.Indicators[j][0] }
