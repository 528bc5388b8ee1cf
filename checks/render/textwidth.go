package render

import "strings"

// Text sizes of the drawings, in SVG user units. The smallest is what the
// narrow-page rule is computed from (minScale).
const (
	nameSize  = 13.0 // a variable's name
	tagSize   = 12.0 // a claim or edit tag on an arrow
	itemSize  = 12.0 // an indicator item beside its construct
	tierSize  = 12.0 // a tier's label
	chartSize = 13.0 // a chart row's label
	tickSize  = 12.0 // a chart axis number
)

// Advance widths as fractions of the font size: deliberately generous,
// at or above those of DejaVu Sans (Debian's default sans-serif, among
// the widest common ones), so that a box made from them holds its text in
// any usual sans-serif. The browser test measures the real widths and
// holds every estimate to be at least as wide.
const (
	emNarrow = 0.33 // i j l . , : ; ' | !
	emThin   = 0.44 // f t r ( ) [ ] space -
	emLower  = 0.66
	emWide   = 1.0 // m w M W —, and anything not listed
	emDigit  = 0.66
	emUpper  = 0.8
	emSymbol = 0.86 // + = < > − → Δ and the like
	boldGain = 1.12
)

// textWidth estimates the advance width of s at a font size in user
// units, bold or not.
func textWidth(s string, size float64, bold bool) float64 {
	w := 0.0
	for _, r := range s {
		w += runeEm(r)
	}
	if bold {
		w *= boldGain
	}
	return w * size
}

func runeEm(r rune) float64 {
	switch {
	case strings.ContainsRune("ijl.,:;'|!", r):
		return emNarrow
	case strings.ContainsRune("ftr()[] -", r):
		return emThin
	case strings.ContainsRune("mwMW—", r):
		return emWide
	case r >= 'a' && r <= 'z', r == '_':
		return emLower
	case r >= '0' && r <= '9':
		return emDigit
	case r >= 'A' && r <= 'Z':
		return emUpper
	case strings.ContainsRune("+=<>−→Δ≤≥#%&*/?\"", r):
		return emSymbol
	}
	return emWide
}
