package checks

// The submission package, format version 1 (schema/package-format.md;
// the JSON Schema is schema/package-v1.schema.json). Field names are the
// JSON names; rules that the validator checks stand in the validate tags,
// the rest in validate.go.

// Package is one submission: what a study claims and what it rests on.
type Package struct {
	FormatVersion            int           `json:"format_version" validate:"required,eq=1"`
	Title                    string        `json:"title" validate:"required,max=1000"`
	ManuscriptID             string        `json:"manuscript_id,omitempty" validate:"max=200"`
	Design                   string        `json:"design" validate:"required,oneof=observational randomized quasi_experimental"`
	Variables                []Variable    `json:"variables" validate:"required,min=2,dive"`
	Graph                    *Graph        `json:"graph,omitempty"`
	Alternatives             []Alternative `json:"alternatives,omitempty" validate:"dive"`
	Claims                   []Claim       `json:"claims" validate:"required,min=1,dive"`
	MissingData              *MissingData  `json:"missing_data,omitempty"`
	TargetTrial              *TargetTrial  `json:"target_trial,omitempty"`
	SmallestEffectOfInterest *float64      `json:"smallest_effect_of_interest,omitempty" validate:"omitempty,gt=0,lte=5"`
	Data                     Data          `json:"data"`
}

// Variable scales.
const (
	ScaleContinuous = "continuous"
	ScaleBinary     = "binary"
	ScaleOrdinal    = "ordinal"
)

// Variable is one measured variable.
type Variable struct {
	Name        string   `json:"name" validate:"required,varname"`
	Label       string   `json:"label,omitempty" validate:"max=1000"`
	Scale       string   `json:"scale" validate:"required,oneof=continuous binary ordinal"`
	Reliability *float64 `json:"reliability,omitempty" validate:"omitempty,gt=0,lte=1"`
	Exogenous   bool     `json:"exogenous,omitempty"`
}

// Edge is one arrow of a graph, by variable names.
type Edge struct {
	From string `json:"from" validate:"required"`
	To   string `json:"to" validate:"required"`
}

// Graph is the declared causal graph.
type Graph struct {
	Edges      []Edge `json:"edges" validate:"dive"`
	FixedEdges []Edge `json:"fixed_edges,omitempty" validate:"dive"`
	// Tiers is a time order over variables, earliest first (waves, or
	// before, during and after the exposure): nothing in a later tier
	// causes anything in an earlier one.
	Tiers                [][]string `json:"tiers,omitempty"`
	Justification        string     `json:"justification,omitempty" validate:"max=20000"`
	EquivalentsDiscussed bool       `json:"equivalents_discussed,omitempty"`
}

// Alternative is another graph the authors considered.
type Alternative struct {
	Name           string `json:"name" validate:"required,max=200"`
	Edges          []Edge `json:"edges" validate:"dive"`
	Justification  string `json:"justification,omitempty" validate:"max=20000"`
	ReportedResult string `json:"reported_result,omitempty" validate:"max=20000"`
}

// Claim kinds.
const (
	KindDirect      = "direct_effect"
	KindTotal       = "total_effect"
	KindAssociation = "association"
	// KindIndirect is the effect of from on to through the mediators of
	// through: the sum over the directed paths through all of them of the
	// products of their coefficients; through empty, the total indirect
	// effect (total minus direct).
	KindIndirect = "indirect_effect"
)

// Causal reports whether claims of this kind are causal.
func Causal(kind string) bool { return kind == KindDirect || kind == KindTotal || kind == KindIndirect }

// Claim is one finding the paper states.
type Claim struct {
	ID   string `json:"id" validate:"required,claimid"`
	Text string `json:"text" validate:"required,max=5000"`
	Kind string `json:"kind" validate:"required,oneof=direct_effect total_effect indirect_effect association"`
	From string `json:"from" validate:"required"`
	To   string `json:"to" validate:"required"`
	// Through are the mediators of an indirect effect, in any order.
	Through        []string  `json:"through,omitempty"`
	AdjustFor      []string  `json:"adjust_for,omitempty"`
	Estimate       *float64  `json:"estimate,omitempty"`
	EstimateScale  string    `json:"estimate_scale,omitempty" validate:"omitempty,oneof=standardized unstandardized correlation odds_ratio log_odds"`
	StdError       *float64  `json:"std_error,omitempty" validate:"omitempty,gt=0"`
	CI             []float64 `json:"ci,omitempty" validate:"omitempty,len=2"`
	CILevel        *float64  `json:"ci_level,omitempty" validate:"omitempty,gt=0,lt=1"`
	PValue         *float64  `json:"p_value,omitempty" validate:"omitempty,gte=0,lte=1"`
	PRelation      string    `json:"p_relation,omitempty" validate:"omitempty,oneof== < >"`
	AssertsAbsence bool      `json:"asserts_absence,omitempty"`
	Headline       bool      `json:"headline,omitempty"`
}

// Missing-data methods.
const (
	MissingNone               = "none"
	MissingCompleteCases      = "complete_cases"
	MissingAvailableCases     = "available_cases"
	MissingMeanSubstitution   = "mean_substitution"
	MissingSingleRegression   = "single_regression"
	MissingCarryForward       = "carry_forward"
	MissingMultipleImputation = "multiple_imputation"
	MissingMaximumLikelihood  = "maximum_likelihood"
	MissingOther              = "other"
)

// MissingData says how the authors handled missing values.
type MissingData struct {
	Method      string `json:"method" validate:"required,oneof=none complete_cases available_cases mean_substitution single_regression carry_forward multiple_imputation maximum_likelihood other"`
	Imputations int    `json:"imputations,omitempty" validate:"gte=0,lte=100000"`
	Description string `json:"description,omitempty" validate:"max=20000"`
}

// TargetTrial is the randomized trial the claims emulate (Hernán & Robins 2016).
type TargetTrial struct {
	Population   string `json:"population,omitempty" validate:"max=5000"`
	Intervention string `json:"intervention,omitempty" validate:"max=5000"`
	Comparator   string `json:"comparator,omitempty" validate:"max=5000"`
	Outcome      string `json:"outcome,omitempty" validate:"max=5000"`
	FollowUp     string `json:"follow_up,omitempty" validate:"max=5000"`
}

// Data kinds.
const (
	DataRows    = "rows"
	DataSummary = "summary"
)

// Data holds raw rows (as CSV) or the summary statistics a paper prints.
type Data struct {
	Kind          string      `json:"kind" validate:"required,oneof=rows summary"`
	File          string      `json:"file,omitempty" validate:"max=1000"`
	CSV           string      `json:"csv,omitempty"`
	MissingCodes  []string    `json:"missing_codes,omitempty" validate:"max=100,dive,max=100"`
	IgnoreColumns []string    `json:"ignore_columns,omitempty" validate:"max=10000"`
	N             int         `json:"n,omitempty" validate:"gte=0,lte=100000000"`
	Variables     []string    `json:"variables,omitempty"`
	Correlations  [][]float64 `json:"correlations,omitempty"`
	SDs           []float64   `json:"sds,omitempty"`
	Means         []float64   `json:"means,omitempty"`
}
