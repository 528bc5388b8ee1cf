// Package load turns a package document and its data into the study the
// pipeline screens: strict JSON decoding, field rules, cross-references,
// graphs, CSV rows or printed summary statistics (package-format.md).
// Every problem found is reported at once, each with its JSON pointer or
// CSV line and column.
//
// Sources: RFC 8259 for JSON, RFC 6901 for JSON pointers, RFC 4180 for
// CSV quoting; Hyndman & Fan (1996), Sample quantiles in statistical
// packages, Am. Stat. 50, for the quantiles of the data-quality screen.
package load
