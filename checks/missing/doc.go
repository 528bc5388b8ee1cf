// Package missing handles incomplete multivariate data under the normal
// model: the missingness patterns, maximum likelihood estimates of the
// mean and covariance by the EM algorithm (Dempster, Laird & Rubin 1977;
// Little & Rubin, Statistical Analysis with Missing Data, ch. 11), Little's
// (1988) test that the data are missing completely at random, multiple
// imputation with proper draws (EM on bootstrap resamples, Honaker & King
// 2010), Rubin's (1987) rules with the Barnard & Rubin (1999) degrees
// of freedom, and the observed information of the saturated normal model
// at the EM estimate (Little & Rubin, sec. 9.1 and 11.2; Savalei 2010),
// summed in the precision matrix's coordinates, whose Cholesky factor
// carries the ML estimates' covariance to coefficients by the delta method
// (Bishop, Fienberg & Holland 1975, sec. 14.6).
//
// Data come as columns, one slice per variable, NaN where a value is
// missing. The package knows nothing of submission packages or reports.
package missing
