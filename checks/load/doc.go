// Package load turns a package document and its data into the study the
// pipeline screens: strict JSON decoding, field rules, cross-references,
// graphs, CSV rows or printed summary statistics (package-format.md).
// Every problem found is reported at once (up to 500), each with its JSON
// pointer or CSV line and column. The document is walked once against the
// package types before anything is decoded, counting every list against
// its limit, so that the work and memory of refusing a package stay in
// proportion to its limits, not to what it holds.
//
// Sources: RFC 8259 for JSON, RFC 6901 for JSON pointers, RFC 4180 for
// CSV quoting; Hyndman & Fan (1996), Sample quantiles in statistical
// packages, Am. Stat. 50, for the quantiles of the data-quality screen;
// Wagner & Fischer (1974) and Ukkonen (1985), banded with a cutoff, for
// the edit distance of "did you mean" hints.
package load
