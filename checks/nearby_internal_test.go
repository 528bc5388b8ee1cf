package checks

import "testing"

// ΔBIC is printed with two decimals unless they would round it across the
// edge of one of Raftery's bands (2, 6, 10).
func TestBICText_BandEdges(t *testing.T) {
	for _, tc := range []struct {
		d    float64
		want string
	}{
		{0.7203, "+0.72"}, {-1.996, "-1.996"}, {1.9999, "+1.9999"}, {2, "+2.00"},
		{-5.999, "-5.999"}, {10.004, "+10.004"}, {-9.2779, "-9.28"}, {0, "+0.00"},
	} {
		if got := bicText(tc.d); got != tc.want {
			t.Errorf("bicText(%g) = %q, want %q", tc.d, got, tc.want)
		}
	}
}
