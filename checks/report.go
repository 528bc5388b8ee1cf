package checks

import (
	"math"
	"math/big"
	"strconv"
	"time"
)

// The screening report, format version 1 (schema/report-format.md;
// the JSON Schema is schema/report-v1.schema.json).

// ReportFormatVersion is the version of the report format.
const ReportFormatVersion = 1

// ToolVersion is the version of pathvet written into every report.
const ToolVersion = "0.1.0"

// Caution is the text every report carries.
const Caution = "An automated screen, not a verdict: pathvet recomputes what the claims rest on " +
	"and points to where they depend on untestable choices. Decisions rest with the editors " +
	"and qualified statistical reviewers."

// Statuses of a check, and severities of a finding (which add info).
const (
	StatusPass          = "pass"
	StatusWarn          = "warn"
	StatusFail          = "fail"
	StatusNotApplicable = "not_applicable"
	SeverityInfo        = "info"
)

// Bands of the score.
const (
	BandLow      = "low-concern"
	BandModerate = "moderate-concern"
	BandHigh     = "high-concern"
)

// Report is the result of one run of the pipeline over one package.
type Report struct {
	FormatVersion     int           `json:"format_version"`
	ToolVersion       string        `json:"tool_version"`
	PackageSHA256     string        `json:"package_sha256"`
	GeneratedAt       time.Time     `json:"generated_at"`
	Title             string        `json:"title"`
	ManuscriptID      string        `json:"manuscript_id,omitempty"`
	Design            string        `json:"design"`
	Score             int           `json:"score"`
	Band              string        `json:"band"`
	ScoreCap          *ScoreCap     `json:"score_cap,omitempty"`
	Caution           string        `json:"caution"`
	SignificanceLevel float64       `json:"significance_level"`
	Checks            []CheckResult `json:"checks"`
	Data              DataReport    `json:"data"`
	Graph             *GraphReport  `json:"graph,omitempty"`
	Claims            []ClaimReport `json:"claims"`
}

// ScoreCap says that the score was capped below what the deductions
// leave, and why (README, "Score").
type ScoreCap struct {
	Cap      int    `json:"cap"`
	Uncapped int    `json:"uncapped"`
	Reason   string `json:"reason"`
}

// DataReport says what the estimates were computed from.
type DataReport struct {
	Kind string `json:"kind"`
	// Rows (raw rows) or N (summary statistics).
	Rows int `json:"rows,omitempty"`
	N    int `json:"n,omitempty"`
	// CompleteCases is the number of rows with every variable observed;
	// Estimation names the moments behind claims[].declared and the fit.
	CompleteCases int    `json:"complete_cases,omitempty"`
	Estimation    string `json:"estimation"`
	Note          string `json:"note,omitempty"`
}

// CheckResult is what one check found.
type CheckResult struct {
	ID       string         `json:"id"`
	Title    string         `json:"title"`
	Status   string         `json:"status"`
	Summary  string         `json:"summary"`
	Findings []Finding      `json:"findings"`
	Metrics  map[string]any `json:"metrics"`
	// Deduction is what this check took off the score (README, "Score").
	Deduction int `json:"score_deduction"`
	// RunError is set when the check could not run to the end.
	RunError string `json:"run_error,omitempty"`
}

// Finding is one observation, tied to a claim where it is about one.
// Key names it for good: the check, the claim and the topic (what it is
// about, never its wording or numbers), so that the same finding on a
// resubmission has the same key (keys.go). Question is the default
// question for the authors, for a fail or warn finding (questions.go).
type Finding struct {
	Key      string         `json:"key"`
	Severity string         `json:"severity"`
	Claim    string         `json:"claim,omitempty"`
	Topic    string         `json:"topic"`
	Message  string         `json:"message"`
	Question string         `json:"question,omitempty"`
	Details  map[string]any `json:"details,omitempty"`
	// ask picks the question where a topic's question depends on what was
	// found (an unexported question kind; "" takes the topic's).
	ask string
}

// GraphReport describes the declared graph and its equivalence class.
type GraphReport struct {
	Acyclic bool `json:"acyclic"`
	// Nodes are the variables that some edge of the declared graph names.
	Nodes []string `json:"nodes"`
	// Declared are the declared graph's arcs; Background the arcs that
	// background knowledge fixes (fixed edges, and every arc out of an
	// exogenous variable); Exogenous the variables declared exogenous.
	Declared   [][2]string `json:"declared,omitempty"`
	Background [][2]string `json:"background_arcs,omitempty"`
	Exogenous  []string    `json:"exogenous,omitempty"`
	// Tiers are graph.tiers, earliest first, each with the variables of
	// the graph in it (a tier with none of them is left empty).
	Tiers [][]string `json:"tiers,omitempty"`
	CPDAG EdgeSets   `json:"cpdag"`
	// PlausibleCPDAG is the CPDAG with the background knowledge's arcs
	// oriented and closed under Meek's rules R1–R4: its arcs are exactly
	// the edges every plausible member orients alike (Meek 1995). Absent
	// when no member is plausible.
	PlausibleCPDAG            *EdgeSets `json:"plausible_cpdag,omitempty"`
	EquivalenceClassSize      any       `json:"equivalence_class_size"`
	EquivalenceClassSizeLog10 *float64  `json:"equivalence_class_size_log10"`
	PlausibleClassSize        any       `json:"plausible_class_size"`
	PlausibleClassSizeLog10   *float64  `json:"plausible_class_size_log10"`
	// EquivalentDAGs lists members of the whole class, each as its arcs;
	// PlausibleDAGs the members that respect the background knowledge.
	EquivalentDAGs          [][][2]string `json:"equivalent_dags"`
	EquivalentDAGsTruncated bool          `json:"equivalent_dags_truncated"`
	PlausibleDAGs           [][][2]string `json:"plausible_dags"`
	PlausibleDAGsTruncated  bool          `json:"plausible_dags_truncated"`
	// NearbyGraphs are classes of graphs one edit from the declared one,
	// best first; SearchBest is where a greedy search from it stopped
	// (nearby-graphs check, nearby_report.go).
	NearbyGraphs []NearbyGraph `json:"nearby_graphs,omitempty"`
	SearchBest   *NearbyGraph  `json:"search_best,omitempty"`
}

// EdgeSets are a partially directed graph's arcs and lines, by name.
type EdgeSets struct {
	Directed   [][2]string `json:"directed"`
	Undirected [][2]string `json:"undirected"`
}

// ClaimReport gathers what the checks found about one claim.
type ClaimReport struct {
	ID   string `json:"id"`
	Text string `json:"text,omitempty"`
	Kind string `json:"kind"`
	From string `json:"from"`
	To   string `json:"to"`
	// Through are an indirect effect's mediators (none: the total
	// indirect effect).
	Through  []string `json:"through,omitempty"`
	Headline bool     `json:"headline"`
	Reported Reported `json:"reported"`
	// ArrowReversible says, for a direct effect, whether the arrow can
	// point the other way in some member of the class, and in some
	// plausible member.
	ArrowReversible *Reversibility `json:"arrow_reversible,omitempty"`
	// Declared is the claim re-estimated under the declared graph.
	Declared *Estimate `json:"declared"`
	// AcrossEquivalents ranges over the plausible equivalent graphs
	// (causal claims with a declared graph).
	AcrossEquivalents *AcrossEquivalents `json:"across_equivalents,omitempty"`
	// UnderAlternatives has one entry per stated alternative.
	UnderAlternatives []AlternativeEstimate `json:"under_alternatives,omitempty"`
	// MissingData has the claim estimated by each way of handling missing
	// values, keyed by method (raw rows with missing values).
	MissingData map[string]*Estimate `json:"missing_data,omitempty"`
	// Absence weighs a claim of no effect (asserts_absence).
	Absence *AbsenceTest `json:"absence_test,omitempty"`
	// OddsRatio: a binary outcome with raw rows.
	OddsRatio *OddsRatioRange `json:"odds_ratio,omitempty"`
	// EValue: a causal claim from a non-randomized design.
	EValue *EValue `json:"e_value,omitempty"`
	// Measurement: the claim re-estimated after correcting for
	// measurement error.
	Measurement *MeasurementResult `json:"measurement,omitempty"`
	// MediatorConfounding: a single-mediator indirect effect with a
	// continuous mediator and outcome (confounding-sensitivity).
	MediatorConfounding *MediatorConfounding `json:"mediator_confounding,omitempty"`
	// ProportionMediated: an indirect effect whose total effect is
	// significant with the same sign (effect-reporting).
	ProportionMediated *ProportionMediated `json:"proportion_mediated,omitempty"`
}

// AlternativeEstimate is a claim re-estimated under a stated alternative.
type AlternativeEstimate struct {
	Name       string    `json:"name"`
	Estimate   *float64  `json:"estimate"`
	CI         []float64 `json:"ci"`
	PValue     *float64  `json:"p_value"`
	Method     string    `json:"method"`
	Equivalent bool      `json:"equivalent"`
	Changed    bool      `json:"changed"`
	// StructuralZero: as in Estimate, why the graph makes it zero.
	StructuralZero string `json:"structural_zero,omitempty"`
	Error          string `json:"error,omitempty"`
	// Significance: as in Estimate, the interval that judges an indirect
	// effect.
	Significance *NamedInterval `json:"significance,omitempty"`
}

// Reported are the figures the package reports for a claim.
type Reported struct {
	Estimate      *float64  `json:"estimate,omitempty"`
	EstimateScale string    `json:"estimate_scale,omitempty"`
	StdError      *float64  `json:"std_error,omitempty"`
	CI            []float64 `json:"ci,omitempty"`
	CILevel       *float64  `json:"ci_level,omitempty"`
	PValue        *float64  `json:"p_value,omitempty"`
	PRelation     string    `json:"p_relation,omitempty"`
}

// Reversibility of a claim's arrow across the equivalence class.
type Reversibility struct {
	InClass     bool `json:"in_class"`
	InPlausible bool `json:"in_plausible"`
	// PlausibleReversed counts the plausible members where it points the
	// other way (a JSON integer or, past 2^53, a decimal string).
	PlausibleReversed any `json:"plausible_reversed"`
}

// ReportDigits is the number of significant digits a report keeps of a
// computed number: more than any check needs, few enough that reports do
// not change with the last bits of a floating-point sum.
const ReportDigits = 10

// round keeps ReportDigits significant digits of x.
func round(x float64) float64 {
	r, _ := strconv.ParseFloat(strconv.FormatFloat(x, 'g', ReportDigits, 64), 64)
	return r
}

// num returns x for a JSON metric, rounded, or nil where x is not a
// finite number: NaN and Inf never reach a report.
func num(x float64) any {
	if p := finite(x); p != nil {
		return *p
	}
	return nil
}

func bigInt(n int64) *big.Int { return big.NewInt(n) }

// exactCount returns n as a JSON integer while it is below 2^53 and as a
// decimal string above, with its base-10 logarithm (nil for 0).
func exactCount(n *big.Int) (any, *float64) {
	var v any = n.String()
	if n.IsInt64() && n.Int64() < 1<<53 {
		v = n.Int64()
	}
	if n.Sign() <= 0 {
		return v, nil
	}
	mant := new(big.Float)
	exp := new(big.Float).SetInt(n).MantExp(mant)
	m, _ := mant.Float64()
	l := math.Round((math.Log10(m)+float64(exp)*math.Log10(2))*1e6) / 1e6
	return v, &l
}
