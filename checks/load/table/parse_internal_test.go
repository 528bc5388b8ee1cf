package table

import (
	"regexp"
	"slices"
	"strings"
	"testing"
)

// varName is the package format's rule for a variable name
// (package-format.md, "Variables").
var varName = regexp.MustCompile(`^[A-Za-z][A-Za-z0-9_]{0,63}$`)

// Numbers as papers print them; each value is the decimal written out
// (exact: strconv gives the nearest double to the same digits).
var numberCases = []struct {
	text  string
	dec   byte
	x     float64
	ok    bool
	enDsh bool
}{
	{".45", '.', 0.45, true, false},
	{"−.22", '.', -0.22, true, false}, // U+2212
	{"-0.22", '.', -0.22, true, false},
	{"–.22", '.', -0.22, true, true}, // an en dash before a number
	{"+0.3", '.', 0.3, true, false},
	{"1.", '.', 1, true, false},
	{"1,204.5", '.', 1204.5, true, false},
	{"1,204", '.', 1204, true, false},
	{"0,45", ',', 0.45, true, false},
	{"−0,45", ',', -0.45, true, false},
	{"1.204,5", ',', 1204.5, true, false},
	{",41", ',', 0.41, true, false},
	{"0,45", '.', 0, false, false}, // a comma is no decimal mark here
	{"12,34", '.', 0, false, false},
	{"1,2345", '.', 0, false, false},
	{".", '.', 0, false, false},
	{"−", '.', 0, false, false},
	{"1e5", '.', 0, false, false},
	{"NaN", '.', 0, false, false},
	{"Inf", '.', 0, false, false},
	{"0x1p3", '.', 0, false, false},
	{"1.2.3", '.', 0, false, false},
	{"--1", '.', 0, false, false},
	{"12345678901234567890123456789012345678901", '.', 0, false, false}, // 41 digits
}

func TestParseNumber(t *testing.T) {
	for _, c := range numberCases {
		x, enDash, ok := parseNumber(c.text, c.dec)
		if ok != c.ok || ok && (x != c.x || enDash != c.enDsh) {
			t.Errorf("parseNumber(%q, %q) = %v, %v, %v; want %v, %v, %v",
				c.text, c.dec, x, enDash, ok, c.x, c.enDsh, c.ok)
		}
	}
}

// Cells: marks are stripped and counted by run, pairs read, dashes kept.
func TestParseCell(t *testing.T) {
	for _, c := range []struct {
		text  string
		kind  kind
		x, sd float64
		marks []string
	}{
		{"−.22**", number, -0.22, 0, []string{"**"}},
		{".31†", number, 0.31, 0, []string{"†"}},
		{".24a", number, 0.24, 0, []string{"a"}},
		{".41 ***", number, 0.41, 0, []string{"***"}},
		{".12*†", number, 0.12, 0, []string{"*", "†"}},
		{"59.3 (6.1)", pair, 59.3, 6.1, nil},
		{"59.3(6.1)", pair, 59.3, 6.1, nil},
		{"3.2 ± 2.4", pair, 3.2, 2.4, nil},
		{"—", dash, 0, 0, nil},
		{"–", dash, 0, 0, nil},
		{"-", dash, 0, 0, nil},
		{"", empty, 0, 0, nil},
		{"Mean", text, 0, 0, nil},
		{"n/a", text, 0, 0, nil},
		{"*", text, 0, 0, nil},
		{"(6.1)", paren, 6.1, 0, nil},
		{"(.84)", paren, 0.84, 0, nil},
		{"(x)", text, 0, 0, nil},
	} {
		got := parseCell(c.text, 1, '.')
		if got.kind != c.kind || got.x != c.x || got.sd != c.sd || !slices.Equal(got.marks, c.marks) {
			t.Errorf("parseCell(%q) = kind %d, %v, %v, %q; want %d, %v, %v, %q",
				c.text, got.kind, got.x, got.sd, got.marks, c.kind, c.x, c.sd, c.marks)
		}
	}
}

func TestNameOf(t *testing.T) {
	for label, want := range map[string]string{
		"Noise exposure (dB)":      "noise_exposure_db",
		"Lärmbelastung":            "larmbelastung",
		"Çalışma süresi":           "calisma_suresi",
		"2nd recall":               "v_2nd_recall",
		"  Self-esteem  ":          "self_esteem",
		"Ωμέγα":                    "",
		"Travels > 45 min (1=yes)": "travels_45_min_1_yes",
		// Cut at 64 characters, a trailing underscore dropped.
		"a_very_long_label_that_goes_on_and_on_past_the_limit_of_sixty_four_characters": "a_very_long_label_that_" +
			"goes_on_and_on_past_the_limit_of_sixty_fo",
		strings.Repeat("ab", 32) + "_m": strings.Repeat("ab", 32),
		strings.Repeat("a", 63) + "_b":  strings.Repeat("a", 63),
	} {
		if got := nameOf(label); got != want {
			t.Errorf("nameOf(%q) = %q; want %q", label, got, want)
		}
		if got := nameOf(label); got != "" && (len(got) > maxName || !varName.MatchString(got)) {
			t.Errorf("nameOf(%q) = %q is not a variable name", label, got)
		}
	}
}

func TestSampleSizes(t *testing.T) {
	for text, want := range map[string][]int{
		"Note. N = 812.":                    {812},
		"n=1,204 adults":                    {1204},
		"(N = 1 204)":                       {1204},
		"Table 2 (n = 640); N = 700 in all": {640, 700},
		"n = 81.2 hours":                    nil,
		"M = 81, SD = 3":                    nil,
		"min = 3":                           nil,
		"N = 99999999999":                   nil, // more digits than an int count holds here
	} {
		if got := sampleSizes(text); !slices.Equal(got, want) {
			t.Errorf("sampleSizes(%q) = %v; want %v", text, got, want)
		}
	}
}

// The separator is chosen by the lines, not by one line's accident.
func TestChooseSeparator(t *testing.T) {
	for text, want := range map[string]separator{
		"a\tb\n1\t\n.2\t1\n":                          tabs,
		"a;b\n1;\n0,2;1\n":                            semicolons,
		"a,b\n1,\n0.2,1\n":                            commas,
		"1. Noise  —\n2. Sleep  .20  —\n":             wideSpaces,
		"1. Noise —\n2. Sleep .20 —\n":                singleSpaces,
		"1. Lärm   —\n2. Schlaf   −0,22   —\n":        wideSpaces, // decimal commas are not separators
		"1. Noise, day  —\n2. Sleep, night  .20  —\n": wideSpaces,
		"\"Noise, day\",1,\n\"Sleep, night\",.20,1\n": commas,
	} {
		if got := chooseSeparator(splitLines(text, maxLines)); got != want {
			t.Errorf("%q: separator %d; want %d", text, got, want)
		}
	}
}

// splitWide cuts where the regular expression \t|\s{2,} would, on the
// space and tab characters lines hold.
func TestSplitWide(t *testing.T) {
	re := regexp.MustCompile(`[\t ]{2,}|\t`)
	for _, s := range []string{"a  b", "a b  c", "a\tb", "a \tb", "a\t b", "a   ", "a", "1. Noise   —   .2",
		"a \t \t b", "x  ", "a b c", "a\t\tb"} {
		if got, want := splitWide(s), re.Split(s, -1); !slices.Equal(got, want) {
			t.Errorf("splitWide(%q) = %q; want %q", s, got, want)
		}
	}
}
