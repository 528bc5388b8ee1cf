package latent

import (
	"errors"
	"fmt"
	"strings"
)

// ErrNotPositiveDefinite is returned when the sample matrix is not.
var ErrNotPositiveDefinite = errors.New("latent: the sample covariance matrix is not positive definite")

// Reason says why a model is not identified.
type Reason int

const (
	// TooFewIndicators: a latent with one indicator, or with two and no
	// arrow or covariance to another structural node (the two-indicator
	// rule, Bollen 1989, ch. 7, needs one).
	TooFewIndicators Reason = iota
	// NegativeDF: more free parameters than distinct sample moments.
	NegativeDF
	// SingularInformation: the expected information is singular (at the
	// starting values, or at the estimates: empirical underidentification);
	// Params are the parameters that move in its null space.
	SingularInformation
)

// UnidentifiedError says why the model cannot be estimated.
type UnidentifiedError struct {
	Reason     Reason
	Latent     int     // TooFewIndicators: the latent (index into Spec.Indicators)
	Indicators int     // TooFewIndicators: how many it has
	DF         int     // NegativeDF: p(p + 1)/2 − q
	Params     []Param // SingularInformation: the parameters involved
}

func (e *UnidentifiedError) Error() string {
	switch e.Reason {
	case TooFewIndicators:
		if e.Indicators == 1 {
			return fmt.Sprintf("latent: latent %d is not identified: it has one indicator", e.Latent)
		}
		return fmt.Sprintf("latent: latent %d is not identified: it has %d indicators and no arrow or covariance "+
			"to another construct or variable", e.Latent, e.Indicators)
	case NegativeDF:
		return fmt.Sprintf("latent: the model is not identified: %d degrees of freedom "+
			"(more free parameters than sample moments)", e.DF)
	}
	names := make([]string, len(e.Params))
	for i, p := range e.Params {
		names[i] = p.String()
	}
	return "latent: the model is not identified: the information matrix is singular in " + strings.Join(names, ", ")
}

// NotConvergedError says that the optimizer stopped short of a minimum.
type NotConvergedError struct {
	Iterations   int
	GradientNorm float64 // the largest |∂F_ML/∂θ| at the last point
	Cause        string
}

func (e *NotConvergedError) Error() string {
	return fmt.Sprintf("latent: no convergence after %d iterations (largest gradient entry %.3g): %s",
		e.Iterations, e.GradientNorm, e.Cause)
}

// ProblemKind names an improper solution.
type ProblemKind int

const (
	// NegativeVariance: a residual, disturbance or source variance below
	// zero (a Heywood case).
	NegativeVariance ProblemKind = iota
	// LoadingAboveOne: a standardized loading above 1 in absolute value.
	LoadingAboveOne
	// LatentCovarianceNotPD: the implied covariance of the latents is not
	// positive definite (a correlation beyond ±1, or a negative variance).
	LatentCovarianceNotPD
	// ResidualCovarianceNotPD: the indicators' residual covariance matrix
	// is not positive definite.
	ResidualCovarianceNotPD
)

func (k ProblemKind) String() string {
	return [...]string{"negative variance", "standardized loading above 1",
		"latent covariance not positive definite", "residual covariance not positive definite"}[k]
}

// Problem is one sign of an improper solution: the estimates are still
// returned, and Result.Proper is false.
type Problem struct {
	Kind     ProblemKind
	To, From int     // the node(s) concerned (−1 when the whole matrix is)
	Value    float64 // the offending value (NaN for a matrix)
}

func (p Problem) String() string {
	if p.To < 0 {
		return p.Kind.String()
	}
	return fmt.Sprintf("%s: nodes %d, %d: %.4g", p.Kind, p.To, p.From, p.Value)
}
