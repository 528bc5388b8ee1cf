// Package effects holds the effect-size arithmetic that reporting checks
// need: p-values from an estimate and its standard error, quantiles and
// tail areas of the normal, t and chi-square kept precise far into the
// tail, two one-sided tests of equivalence, power, E-values with their
// conversions to the risk-ratio scale, and Spearman's correction for
// attenuation. Plain functions on numbers and gonum matrices, with gonum's
// distributions.
//
// Sources:
//
//	Abramowitz & Stegun (1964), Handbook of Mathematical Functions, 26.7.5
//	(Cornish–Fisher t quantiles).
//	Lenth (1989), Algorithm AS 243: cumulative distribution function of the
//	non-central t distribution, Appl. Statist. 38; Guenther (1978), J.
//	Statist. Comput. Simul. 6 (the twin series), with Gauss–Legendre
//	quadrature where its terms would underflow.
//	Hill (1970), Algorithm 395: Student's t-distribution, CACM 13.
//	Schuirmann (1987), two one-sided tests of equivalence, J. Pharmacokinet.
//	Biopharm. 15.
//	VanderWeele & Ding (2017), Sensitivity analysis in observational research:
//	introducing the E-value, Ann. Intern. Med. 167.
//	Spearman (1904), The proof and measurement of association between two
//	things, Am. J. Psychol. 15.
package effects
