// Package mediation computes indirect effects in linear recursive path
// models: the effect of x on y through a set of mediators as the sum over
// directed paths of coefficient products, read off the total-effect matrix
// T = (I − B)⁻¹ (Wright 1934; Alwin & Hauser 1975; Bollen 1987), its
// standardized form, its first-order standard error by the multivariate
// delta method with the analytic gradient dT = T dB T (Sobel 1982), the
// Monte Carlo interval from the coefficients' joint normal (MacKinnon,
// Lockwood & Williams 2004), the percentile bootstrap from raw rows with
// multinomial resampling weights (Efron & Tibshirani 1993; Shrout &
// Bolger 2002), and the mediator–outcome error correlation at which a
// single-mediator effect vanishes (Imai, Keele & Yamamoto 2010). The
// product of coefficients has a skewed sampling distribution (Preacher &
// Hayes 2008), which is why the intervals are percentile intervals.
//
// The package knows nothing of packages or reports: nodes are indices,
// data are columns, coefficients and their covariance are gonum matrices.
//
// Conventions: the coefficients' covariance is an input (Model.Cov), one
// block per equation. FitModel makes it from moments with either the
// n − k − 1 divisor of pathvet's reports (OLS) or the divisor n of
// maximum likelihood (ML), which the tests use to match the R SEM
// reference (testdata/reference/mediation/indirect.R, Debian's R SEM
// package). Intervals use the percentile rule of Davison & Hinkley (1997).
//
// Sources:
//
//	Wright (1934), The method of path coefficients, Ann. Math. Statist. 5.
//	Alwin & Hauser (1975), The decomposition of effects in path analysis, Am. Sociol. Rev. 40.
//	Sobel (1982), Asymptotic confidence intervals for indirect effects in structural equation models,
//	Sociological Methodology 13.
//	Bollen (1987), Total, direct, and indirect effects in structural equation models,
//	Sociological Methodology 17.
//	Efron & Tibshirani (1993), An Introduction to the Bootstrap.
//	Davison & Hinkley (1997), Bootstrap Methods and Their Application.
//	Shrout & Bolger (2002), Mediation in experimental and nonexperimental studies, Psychol. Methods 7.
//	MacKinnon, Lockwood & Williams (2004), Confidence limits for the indirect effect: distribution of
//	the product and resampling methods, Multivariate Behav. Res. 39.
//	Preacher & Hayes (2008), Asymptotic and resampling strategies for assessing and comparing
//	indirect effects in multiple mediator models, Behav. Res. Methods 40.
//	Imai, Keele & Yamamoto (2010), Identification, inference and sensitivity analysis for causal
//	mediation effects, Statist. Sci. 25(1).
//	Imai, Keele & Tingley (2010), A general approach to causal mediation analysis, Psychol. Methods 15(4).
//	Preacher & Selig (2012), Advantages of Monte Carlo confidence intervals for indirect effects,
//	Commun. Methods Meas. 6.
package mediation
