package checks

import (
	"cmp"
	"context"
	"encoding/json"
	"fmt"
	"reflect"
	"time"
)

// Check is one step of the screening pipeline.
type Check struct {
	ID    string
	Title string
	Run   func(ctx context.Context, a *Analysis) (CheckResult, error)
	// Summaries has the summary sentence of every status the check can
	// end with. Run may return a sentence more specific to the package,
	// which replaces it; a status without a summary here is an internal
	// error, reported as such.
	Summaries map[string]string
}

// Pipeline returns the checks in pipeline order (report-format.md, "Fixed
// check ids", with nearby-graphs after alternatives). causal-language
// reads the E-values that confounding-sensitivity computes, so it runs
// after it.
func Pipeline() []Check {
	return []Check{
		graphDeclaredCheck,
		graphFitCheck,
		equivalenceCheck,
		alternativesCheck,
		nearbyGraphsCheck,
		missingDataCheck,
		effectReportingCheck,
		confoundingCheck,
		measurementCheck,
		causalLanguageCheck,
	}
}

// Options tune one run of the pipeline.
type Options struct {
	// Alpha is the significance level; 0 means DefaultAlpha.
	Alpha float64
	// Now stamps the report; nil means time.Now.
	Now func() time.Time
	// Checks to run; nil means Pipeline().
	Checks []Check
	// Progress, when set, hears how far the screening is: the stage (the
	// check about to run, or a long step inside one, such as the
	// imputations) and how many of its total units are done. Calls come
	// one at a time, not always from the goroutine that called Run.
	Progress func(stage string, done, total int)
	// Resamples is the number of bootstrap resamples of an indirect
	// effect with raw rows; 0 means mediation.DefaultResamples.
	Resamples int
}

// Analysis is one run of the pipeline over a study: the study, results
// that several checks share, computed once on first use (never by one
// check for another), and the graph and claim sections a check annotates.
// Each check gets sections of its own, empty when it starts; the pipeline
// merges them into the report after it returns, so no check can read
// another's annotations, and the checks give the same results in any
// order or subset.
type Analysis struct {
	Study  *Study
	Alpha  float64
	Graph  *GraphReport
	Claims []ClaimReport

	equivalence  *equivalenceResult
	mom          *Moments
	momErr       error
	recoded      *Moments // the likely missing codes read as missing (reported.go)
	recodedErr   error
	dataErr      error
	fits         map[string]est
	declared     []*est
	plausible    []alternativeGraph
	plausibleErr error
	miss         *missingResult
	evs          []claimEValue
	across       []*AcrossEquivalents
	acrossErr    []error
	acrossDone   []bool
	condChecked  *Moments // the moments condOK is about (wellConditioned)
	condOK       bool
	progress     func(stage string, done, total int)
	// estimation is the study's estimator (estimator.go); ctx the run's
	// context, for estimates started lazily.
	estimation estimator
	ctx        context.Context
	// bootResamples is Options.Resamples; seed the run's seed of every
	// draw, once seeded (indirect_draws.go).
	bootResamples int
	seed          uint64
	seeded        bool
	// rhos and rhoWhy are the indirect claims' mediator–outcome
	// sensitivity, or why there is none (mediatorSensitivity).
	rhos   []*MediatorConfounding
	rhoWhy []string
}

// reportProgress passes progress to Options.Progress, if set.
func (a *Analysis) reportProgress(stage string, done, total int) {
	if a.progress != nil {
		a.progress(stage, done, total)
	}
}

// Run screens the study and returns its report. It stops with ctx's error
// when ctx is cancelled. A check that panics or fails is reported as a
// failed check with its reason; the other checks still run.
func Run(ctx context.Context, s *Study, opt Options) (*Report, error) {
	if opt.Alpha == 0 {
		opt.Alpha = DefaultAlpha
	}
	if opt.Now == nil {
		opt.Now = time.Now
	}
	if opt.Checks == nil {
		opt.Checks = Pipeline()
	}
	a := &Analysis{Study: s, Alpha: opt.Alpha, Claims: claimReports(s.Package), progress: opt.Progress, ctx: ctx,
		bootResamples: opt.Resamples}
	rep := &Report{
		FormatVersion: ReportFormatVersion, ToolVersion: ToolVersion, PackageSHA256: s.SHA256,
		Title: s.Package.Title, ManuscriptID: s.Package.ManuscriptID, Design: s.Package.Design,
		Caution: Caution, SignificanceLevel: opt.Alpha,
	}
	claims, graph := claimReports(s.Package), (*GraphReport)(nil)
	for k, c := range opt.Checks {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		a.reportProgress("checks (now: "+c.Title+")", k, len(opt.Checks))
		a.Claims, a.Graph = claimReports(s.Package), nil // this check's annotations only
		res := runCheck(ctx, c, a)
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		rep.Checks = append(rep.Checks, res)
		if res.RunError == "" {
			mergeClaims(claims, a.Claims)
			graph = mergeGraph(graph, a.Graph)
		}
	}
	a.reportProgress("checks", len(opt.Checks), len(opt.Checks))
	a.Claims, a.Graph = claims, graph
	a.fillDeclared()
	rep.Data = a.dataReport()
	rep.Graph, rep.Claims = a.Graph, a.Claims
	score(rep)
	rep.GeneratedAt = opt.Now().UTC().Truncate(time.Second)
	return rep, nil
}

// runCheck runs one check, turning a panic, an error or a result that
// cannot be encoded into a failed check that says so.
func runCheck(ctx context.Context, c Check, a *Analysis) (res CheckResult) {
	defer func() {
		if p := recover(); p != nil {
			res = failedToRun(c, fmt.Sprintf("internal error: %v", p))
		}
	}()
	res, err := c.Run(ctx, a)
	if err != nil {
		return failedToRun(c, err.Error())
	}
	declared, ok := c.Summaries[res.Status]
	if !ok {
		return failedToRun(
			c,
			fmt.Sprintf("internal error: the check ended with status %q, for which it declares no summary", res.Status),
		)
	}
	res.Summary = cmp.Or(res.Summary, declared)
	res.ID, res.Title = c.ID, c.Title
	if res.Findings == nil {
		res.Findings = []Finding{}
	}
	a.identify(c.ID, res.Findings)
	if res.Metrics == nil {
		res.Metrics = map[string]any{}
	}
	if _, err := json.Marshal(res); err != nil {
		return failedToRun(c, "its result could not be encoded: "+err.Error())
	}
	return res
}

func failedToRun(c Check, why string) CheckResult {
	return CheckResult{
		ID: c.ID, Title: c.Title, Status: StatusFail,
		Summary:  "This check could not run to the end, so the report is incomplete; a reviewer should look at this part by hand.",
		Findings: []Finding{}, Metrics: map[string]any{}, RunError: why,
	}
}

func (a *Analysis) dataReport() DataReport {
	d := a.Study.Data
	r := DataReport{Kind: d.Kind, Estimation: "summary"}
	if d.Kind == DataSummary {
		r.N = d.N
		return r
	}
	r.Rows, r.Estimation = d.N, "complete_cases"
	m, err := a.moments()
	if err != nil {
		r.Note = a.dataError().Error()
		return r
	}
	r.CompleteCases = m.N
	if m.N < d.N {
		r.Note = fmt.Sprintf("estimates use the %d complete cases of %d rows", m.N, d.N)
	}
	return r
}

// fillDeclared puts every claim's declared estimate into the report.
func (a *Analysis) fillDeclared() {
	for i := range a.Claims {
		a.Claims[i].Declared = a.safeDeclared(i)
	}
}

// safeDeclared is the declared estimate of claim i; a panic in the
// estimators becomes an estimate that says it could not be made.
func (a *Analysis) safeDeclared(i int) (r *Estimate) {
	defer func() {
		if p := recover(); p != nil {
			r = &Estimate{Error: fmt.Sprintf("internal error: %v", p), AdjustedFor: []string{}}
		}
	}()
	return a.report(a.declaredEstimate(i))
}

// mergeClaims copies into dst every annotation that a check set in src
// (a field of src that is not its zero value and is zero in dst).
func mergeClaims(dst, src []ClaimReport) {
	for i := range dst {
		d, s := reflect.ValueOf(&dst[i]).Elem(), reflect.ValueOf(src[i])
		for f := range d.NumField() {
			if !s.Field(f).IsZero() && d.Field(f).IsZero() {
				d.Field(f).Set(s.Field(f))
			}
		}
	}
}

// mergeGraph merges a check's graph section into the report's: fields
// that src sets and dst leaves zero.
func mergeGraph(dst, src *GraphReport) *GraphReport {
	switch {
	case src == nil:
		return dst
	case dst == nil:
		return src
	}
	d, s := reflect.ValueOf(dst).Elem(), reflect.ValueOf(src).Elem()
	for f := range d.NumField() {
		if !s.Field(f).IsZero() && d.Field(f).IsZero() {
			d.Field(f).Set(s.Field(f))
		}
	}
	return dst
}

func claimReports(pkg *Package) []ClaimReport {
	out := make([]ClaimReport, len(pkg.Claims))
	for i, c := range pkg.Claims {
		out[i] = ClaimReport{
			ID: c.ID, Text: c.Text, Kind: c.Kind, From: c.From, To: c.To, Through: c.Through, Headline: c.Headline,
			Reported: Reported{
				Estimate: c.Estimate, EstimateScale: c.EstimateScale, StdError: c.StdError,
				CI: c.CI, CILevel: c.CILevel, PValue: c.PValue, PRelation: c.PRelation,
			},
		}
	}
	return out
}

// worst returns the more serious of two statuses or severities.
func worst(a, b string) string {
	if rank(b) > rank(a) {
		return b
	}
	return a
}

func rank(s string) int {
	switch s {
	case StatusFail:
		return 4
	case StatusWarn:
		return 3
	case StatusPass:
		return 2
	case SeverityInfo:
		return 1
	}
	return 0
}

// statusOf is the status that a list of findings earns: its worst
// severity, pass when none is worse than info.
func statusOf(findings []Finding) string {
	s := StatusPass
	for _, f := range findings {
		if f.Severity == StatusWarn || f.Severity == StatusFail {
			s = worst(s, f.Severity)
		}
	}
	return s
}
