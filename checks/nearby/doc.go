// Package nearby scores the DAGs one edit away from a declared linear path
// model: every arrow added (either direction) between non-adjacent nodes,
// removed or reversed, kept when it is acyclic and respects background
// knowledge (no arrow into an exogenous node, fixed arrows kept as they
// are); groups them by Markov equivalence class; and runs a greedy search
// from the declared graph.
//
// The score is the χ²-based BIC of package sem, BIC = T + q ln N with
// T = (N − 1) F_ML. For a recursive model fitted node by node,
// tr(S Σ̂⁻¹) = p and ln|Σ̂| = Σ_v ln ψ_v, so
//
//	BIC = (N − 1) (Σ_v ln ψ_v − ln|S|) + Σ_v (|pa(v)| + 1) ln N
//
// decomposes over nodes (ψ_v is the ML residual variance of v on its
// parents): an edit changes the terms of the one or two nodes whose parents
// change. Adding u to the parents of v multiplies ψ_v by 1 − r², with r the
// partial correlation of v and u given pa(v) (Anderson, An Introduction to
// Multivariate Statistical Analysis, §2.5), so
//
//	ΔBIC(add u → v) = (N − 1) ln(1 − r²) + ln N
//
// and removing an arrow is the same with the sign turned; a reversal is
// one removal plus one addition at the other node.
//
// Equivalent DAGs have the same skeleton and v-structures (Verma & Pearl
// 1990) and, the model being Gaussian, the same BIC; among one-edit
// neighbours two are equivalent exactly when they change the same pair's
// adjacency and destroy and create the same v-structures, all of which
// involve the edited pair.
//
// Sources: Raftery (1995), Bayesian model selection in social research,
// Sociological Methodology 25, for the bands of ΔBIC; Chickering (2002),
// Optimal structure identification with greedy search, JMLR 3, for
// decomposable scores and score equivalence in greedy search.
//
// The package knows nothing of submission packages or reports: it works on
// node indices, parent lists and a gonum covariance or correlation matrix.
package nearby
