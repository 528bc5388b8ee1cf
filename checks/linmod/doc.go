// Package linmod fits the regressions that claims rest on: ordinary least
// squares from a covariance or correlation matrix and n (as papers print
// them) or from raw rows, logistic regression for binary outcomes, and
// partial correlations with Fisher's z test. It uses gonum for the linear
// algebra and the distributions, and knows nothing of packages or reports.
//
// Conventions (../shared/spec/checks.md): standard errors use n − k − 1
// residual degrees of freedom and p-values the t distribution with those
// degrees of freedom; logistic regression uses Wald z tests.
package linmod
