// Package guess reads raw rows (a CSV with a header) and guesses what a
// starting package needs from them: which columns can be variables, each
// one's scale, the missing marks and likely missing codes, and the values
// to look at. `pathvet init --data` and the workspace's "new screening"
// page both use it, so they guess alike.
//
// Rules (common practice, stated as such): a column of 0 and 1 only is
// binary; whole numbers with 3 to 10 distinct values, each seen three
// times on average, are ordinal (a rating scale); anything else is
// continuous. Likely missing codes and far-out values are load.Suspects
// (Tukey's far-out fences, three interquartile ranges beyond the
// quartiles; Tukey 1977, Exploratory Data Analysis), and in a column of
// 0 and 1 any code-like value (99, −9999; load.CodeLike).
package guess
