package checks

// NearbyGraph is one Markov equivalence class of graphs near the declared
// graph, as graph.nearby_graphs and graph.search_best show it.
type NearbyGraph struct {
	// Edits turn the declared graph into a member of the class.
	Edits []GraphEdit `json:"edits"`
	// DeltaBIC is the class's BIC minus the declared graph's, with the
	// χ²-based BIC of graph-fit (negative: the class fits better).
	DeltaBIC *float64 `json:"delta_bic"`
	// Evidence is Raftery's (1995) band of |ΔBIC|: indistinguishable
	// (below 2), positive (2–6), strong (6–10), very_strong (above 10);
	// Favours says for which graph ("declared", "nearby", or "neither"
	// when indistinguishable).
	Evidence string `json:"evidence"`
	Favours  string `json:"favours"`
	// The class's size and its part that respects the background
	// knowledge (exact counts; null when not counted).
	EquivalenceClassSize any `json:"equivalence_class_size"`
	PlausibleClassSize   any `json:"plausible_class_size"`
	// Alternative names the stated alternative in this class, if any.
	Alternative string `json:"alternative,omitempty"`
	// Claims are the causal claims re-estimated across the class's
	// plausible members (classes within ΔBIC 2, the listed classes that fit
	// better by 2 or more, and the search's best).
	Claims map[string]NearbyClaim `json:"claims,omitempty"`
	// ClaimsNotExamined are the causal claims that were not re-estimated
	// in a class whose claims were, each with the reason (too many
	// locally valid parent sets to list).
	ClaimsNotExamined map[string]string `json:"claims_not_examined,omitempty"`
}

// GraphEdit is one edit of the declared graph: the arrow From → To added,
// removed, or reversed (From → To is its declared direction).
type GraphEdit struct {
	Op   string `json:"op"`
	From string `json:"from"`
	To   string `json:"to"`
}

// NearbyClaim is a claim's range across a nearby class.
type NearbyClaim struct {
	Min                      *float64 `json:"min"`
	Max                      *float64 `json:"max"`
	ShareSignificantSameSign *float64 `json:"share_significant_same_sign"`
	Graphs                   int      `json:"graphs"`
	Method                   string   `json:"method"`
	// Changed: the claim's sign or significance differs from the declared
	// graph's in some graph of the class.
	Changed bool `json:"changed"`
	// NotComputed says why the claim was not re-estimated in the class.
	NotComputed string `json:"not_computed,omitempty"`
}
