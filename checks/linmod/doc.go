// Package linmod fits the regressions that claims rest on: ordinary least
// squares from a covariance or correlation matrix and n (as papers print
// them, or as computed once from raw rows), logistic regression for binary
// outcomes, and partial correlations with Fisher's z test. It uses gonum
// for the linear algebra and effects for the tail areas, and knows nothing
// of packages or reports. A QR fit of the raw rows is the tests' oracle.
//
// Many fits that share most predictors (the locally valid parent sets of
// one node) are made by Bordered: the shared block is factored once and
// each fit solves only for its own few predictors given it, by block
// elimination of the normal equations (the Schur complement; Golub & Van
// Loan, Matrix Computations). It makes no condition check
// of its own; WellConditioned shows, by Cauchy's interlacing theorem
// (Horn & Johnson, Matrix Analysis), when none could fail.
//
// Conventions (README, "Checks"): standard errors use n − k − 1
// residual degrees of freedom and p-values the t distribution with those
// degrees of freedom; logistic regression uses Wald z tests.
package linmod
