package checks

import (
	"fmt"
	"strings"

	"gonum.org/v1/gonum/mat"
)

// olsFit is what an OLS estimate of a claim is fitted from: the
// covariance matrix (the correlation matrix on the standardized scale),
// the means when they are used, the scale reported, and a note when the
// claim's own scale could not be used.
type olsFit struct {
	cov   mat.Symmetric
	means []float64
	scale string
	note  string
}

// olsInput chooses how a claim on scale with outcome y is fitted from m:
// by OLS (ok), or otherwise by logistic regression (a binary outcome with
// raw rows) or as a partial correlation (the correlation scale).
func (a *Analysis) olsInput(m *Moments, y int, scale string) (olsFit, bool) {
	binary := a.Study.Package.Variables[y].Scale == ScaleBinary
	switch {
	case binary && m.Rows != nil, scale == "correlation":
		return olsFit{}, false
	case scale == "unstandardized" && m.SD != nil:
		return olsFit{cov: m.Cov(), means: m.Means, scale: "unstandardized"}, true
	}
	note := ""
	if scale != "standardized" {
		note = fmt.Sprintf(
			"estimated as a standardized coefficient: the %s scale needs %s",
			scaleName(scale),
			needs(scale),
		)
	}
	if binary {
		note = strings.TrimPrefix(
			note+"; ",
			"; ",
		) + "the binary outcome is treated as continuous (moments without rows allow no logistic regression)"
	}
	return olsFit{cov: m.Cor, scale: "standardized", note: note}, true
}
