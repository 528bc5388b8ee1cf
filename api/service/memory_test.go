package service

import "testing"

func TestCSVShape(t *testing.T) {
	for _, tc := range []struct {
		csv        string
		rows, cols int
	}{
		{"a,b,c\n1,2,3\n4,5,6\n", 2, 3},
		{"a,b,c\n1,2,3\n4,5,6", 2, 3},
		{"a\n", 0, 1},
		{"", 0, 0},
	} {
		if r, c := CSVShape([]byte(tc.csv)); r != tc.rows || c != tc.cols {
			t.Errorf("%q: %d × %d, want %d × %d", tc.csv, r, c, tc.rows, tc.cols)
		}
	}
}

// The model against the measurements its constants came from (max RSS of
// pathvet check, 5 columns), within 35%: a guard against editing the
// constants, not an outside check.
func TestWorkingMemory_Calibration(t *testing.T) {
	for _, m := range []struct {
		rows     int
		measured float64 // bytes
	}{{100_000, 217e6}, {400_000, 809e6}} {
		got := float64(WorkingMemory(m.rows, 5))
		if got < 0.65*m.measured || got > 1.35*m.measured {
			t.Errorf("%d rows: estimate %.0f MB, measured %.0f MB", m.rows, got/1e6, m.measured/1e6)
		}
	}
}

func TestCheckMemory(t *testing.T) {
	csv := []byte("a,b\n1,2\n3,4\n")
	if err := CheckMemory(csv, 1<<30); err != nil {
		t.Fatal(err)
	}
	if err := CheckMemory(csv, 1<<20); ErrorCode(err) != EInvalid {
		t.Fatalf("over budget: %v", err)
	}
}
