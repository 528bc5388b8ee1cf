// Package review turns a report into what a reviewer decides and what the
// authors are sent: each finding with the decision in force on it (the
// reviewer's, one carried over from an earlier version of the manuscript,
// or the default: ask the authors about fail and warn findings, note info
// findings for the editor), the letter's items (findings that ask the same
// question of several claims grouped into one item that names the claims
// with their text, headline claims first, then by severity), what became
// of an earlier version's questions (answered, still open, changed), and
// what the authors changed in the package (claims, arrows, data, method).
//
// It reads reports and packages only (the checks' types) and holds no
// state: the service keeps the decisions and hands them in.
package review
