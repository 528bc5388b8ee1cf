// Package dag holds the graph core of pathvet: directed acyclic graphs and
// partially directed graphs over nodes 0..n-1, cycles and topological order,
// the basis set of implied d-separations, skeletons and v-structures, the
// CPDAG of a DAG (Chickering's edge labelling; Meek's rules once background
// knowledge orients more), the exact size of a Markov equivalence class (the
// clique-picking recursion), the part of a class that respects background knowledge, the
// members of a class listed in a fixed order, and IDA's locally valid parent
// sets.
//
// The package knows nothing of submission packages or reports: it works on
// node indices and plain slices, and uses the standard library only.
//
// Sources:
//
//	Verma & Pearl (1990), Equivalence and synthesis of causal models.
//	Meek (1995), Causal inference and causal explanation with background knowledge.
//	Chickering (1995), A transformational characterization of equivalent Bayesian
//	network structures, UAI 11 (Find-Compelled).
//	Andersson, Madigan & Perlman (1997), A characterization of Markov equivalence classes.
//	He, Jia & Yu (2015), Counting and exploring sizes of Markov equivalence classes, JMLR 16.
//	Wienöbst, Bannach & Liśkiewicz (2023), Polynomial-time algorithms for counting
//	and sampling Markov equivalent DAGs with applications, JMLR 24.
//	Perković, Kalisch & Maathuis (2017), Interpreting and using CPDAGs with
//	background knowledge, UAI 33.
//	Maathuis, Kalisch & Bühlmann (2009), Estimating high-dimensional intervention
//	effects from observational data, Ann. Statist. 37.
package dag
