// Package render draws a screening report for people: the text view, the
// HTML page with its SVG graph and chart, and the letter of questions.
// Its only input is the report (package checks, types only).
//
// # The graph drawing
//
// LayOut lays a graph out in layers, the framework of Sugiyama, Tagawa &
// Toda (1981, "Methods for visual understanding of hierarchical system
// structures", IEEE Trans. SMC 11(2):109–125) with refinements of
// Gansner, Koutsofios, North & Vo (1993, "A technique for drawing directed
// graphs", IEEE Trans. Softw. Eng. 19(3):214–230):
//
//   - cycles broken by reversing the back arcs of a depth-first search
//     (Gansner et al. §2.1); rows by longest path, sources moved down to
//     just above their highest child, or by tier when tiers are given;
//
//   - a tag row between every two rows of variables, and every arrow cut
//     into a chain of virtual nodes, one per row it crosses; an arrow's
//     tag is a virtual node as wide as the tag (Gansner et al. §4, the
//     label as a node in the middle of its edge);
//
//   - crossings reduced by barycentre sweeps down and up (Sugiyama et al.)
//     each followed by transposition of neighbours (Gansner et al. §3),
//     the order with the fewest crossings kept; crossings between two
//     rows counted as inversions (Barth, Jünger & Mutzel 2004, "Simple and
//     efficient bilayer cross counting", J. Graph Algorithms Appl. 8(2));
//
//   - x by rounds of row-by-row weighted least squares under the row's
//     order and separations,
//
//     minimise Σ_k w_k (x_k − t_k)²  subject to  x_{k+1} − x_k ≥ s_k,
//
//     with t_k the weighted mean x of an item's links in the row just
//     placed and link weights 1, 2 and 8 (Gansner et al. §4.2), solved
//     exactly by pool-adjacent-violators on x_k − Σ_{j<k} s_j (Barlow,
//     Bartholomew, Bremner & Brunk 1972, Statistical Inference under
//     Order Restrictions, ch. 1); runs of virtual nodes then set to one x
//     where the rows leave room, so that long arrows run straight;
//
//   - each arrow drawn as vertical runs through the rows it crosses (at
//     its virtual nodes, where nothing else is) and S-curves through the
//     gaps between rows (where only arrows are), so that no arrow passes
//     through a variable or a tag; arrows meet a shape portStep apart.
//
// Arrows within one tier are arches in a band above their row, each on
// the lowest level where it overlaps no other, their tags placed where
// no vertical line crosses the level. A construct is an ellipse with its
// items listed beside it, one footprint in its row.
//
// Every arrow has one kind with a line, a head and a legend entry of its
// own (arcs.go); the legend lists exactly the kinds drawn. Text widths
// are estimated generously (textwidth.go); a drawing is never set so
// narrow that its smallest text falls below 11 CSS pixels, and scrolls
// within its figure instead. The tests read each SVG back and check its
// geometry (drawgeom_test.go) for the demos, the calibration packages and
// seeded random graphs of 2 to 40 variables; the browser test measures
// the same in Chromium.
package render
