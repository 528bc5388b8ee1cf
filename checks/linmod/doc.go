// Package linmod fits the regressions that claims rest on: ordinary least
// squares from a covariance or correlation matrix and n (as papers print
// them, or as computed once from raw rows), logistic regression for binary
// outcomes, and partial correlations with Fisher's z test. It uses gonum
// for the linear algebra and effects for the tail areas, and knows nothing
// of packages or reports. A QR fit of the raw rows is the tests' oracle.
//
// Conventions (README, "Checks"): standard errors use n − k − 1
// residual degrees of freedom and p-values the t distribution with those
// degrees of freedom; logistic regression uses Wald z tests.
package linmod
