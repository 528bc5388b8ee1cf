package render

import (
	"math"
	"regexp"
	"strconv"
	"testing"
)

// luminance is the relative luminance of an sRGB colour "#rrggbb", by the
// definition in WCAG 2.1 (W3C Recommendation, 2018, "relative luminance").
func luminance(hex string) float64 {
	var l [3]float64
	for i := range l {
		v, _ := strconv.ParseUint(hex[1+2*i:3+2*i], 16, 8)
		c := float64(v) / 255
		if c <= 0.03928 {
			l[i] = c / 12.92
		} else {
			l[i] = math.Pow((c+0.055)/1.055, 2.4)
		}
	}
	return 0.2126*l[0] + 0.7152*l[1] + 0.0722*l[2]
}

// contrast is the WCAG 2.1 contrast ratio (L1 + 0.05) / (L2 + 0.05).
func contrast(a, b string) float64 {
	la, lb := luminance(a), luminance(b)
	return (max(la, lb) + 0.05) / (min(la, lb) + 0.05)
}

var cssVar = regexp.MustCompile(`--([a-z-]+): (#[0-9a-f]{6});`)

// TestContrast: every text colour of the stylesheet on every background
// it is used on reaches WCAG AA for normal text (4.5:1).
func TestContrast(t *testing.T) {
	if c := contrast("#777777", "#ffffff"); math.Abs(
		c-4.48,
	) > 0.01 { // #777 on white is 4.48, from memory, the usual example of just missing AA
		t.Fatalf("the contrast formula gives %.3f for #777 on white", c)
	}
	vars := map[string]string{"white": "#ffffff"}
	for _, m := range cssVar.FindAllStringSubmatch(styleCSS, -1) {
		vars[m[1]] = m[2]
	}
	// The navigation bar is paper and ink now (issue 22.5), so the pairs
	// of its former dark bar are gone; so is the green of a passing check,
	// which reads in the ink and soft colours.
	pairs := [][2]string{
		{"ink", "paper"}, {"soft", "paper"}, {"accent", "paper"}, {"fail", "paper"}, {"warn", "paper"},
		{"ink", "panel"}, {"soft", "panel"}, {"ink", "mark-bg"}, {"fail", "mark-bg"}, {"soft", "white"},
		{"fail", "white"}, {"accent", "white"}, {"white", "accent"}, {"white", "fail"},
	}
	for _, p := range pairs {
		fg, bg := vars[p[0]], vars[p[1]]
		if fg == "" || bg == "" {
			t.Fatalf("colour %s or %s is not in the stylesheet", p[0], p[1])
		}
		if c := contrast(fg, bg); c < 4.5 {
			t.Errorf("%s (%s) on %s (%s): contrast %.2f, below 4.5", p[0], fg, p[1], bg, c)
		}
	}
}
