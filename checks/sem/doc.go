// Package sem tests and fits recursive linear path models: the maximum
// likelihood fit of a DAG to a covariance matrix (node by node, each
// variable regressed on its parents), the chi-square test and the usual
// fit indices (RMSEA with its interval from the noncentral chi-square,
// CFI, TLI, SRMR, AIC, BIC), and the tests of a DAG's implied
// independences (Fisher's z, Holm's adjustment, Shipley's C).
//
// Sources: Jöreskog (1967) for F_ML; Steiger (1990) and Browne & Cudeck
// (1993) for RMSEA; Bentler (1990) for CFI; Tucker & Lewis (1973) for TLI;
// Shipley (2000), Cause and Correlation in Biology, for the basis set and
// C; Holm (1979) for the step-down adjustment.
package sem
