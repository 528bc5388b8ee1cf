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

// The model against the measurements its constants came from (maximum
// resident set of one screening job of the costliest cohort packages, the
// rows kept and a pattern in nearly every row, testdata/bench/
// worker-memory.sh, two imputation workers; and the audit's figure for the
// same shape): at least 5% above each, and within 35%: a guard against
// editing the constants, not an outside check.
func TestWorkingMemory_Calibration(t *testing.T) {
	for _, m := range []struct {
		name       string
		rows, cols int
		measured   float64 // bytes
	}{
		{"cells-binary-outcome, worker", 200_000, 30, 541e6},
		{"cells-binary, worker", 395_000, 30, 954e6},
		{"cells-binary-outcome, worker", 395_000, 30, 960e6},
		{"cells-binary-outcome, pathvet check", 395_000, 30, 961e6},
		{"the audit's job", 395_000, 30, 1020e6},
	} {
		got := float64(WorkingMemory(m.rows, m.cols))
		if got < 1.05*m.measured || got > 1.35*m.measured {
			t.Errorf("%s: estimate %.0f MB, measured %.0f MB", m.name, got/1e6, m.measured/1e6)
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

// MaxCells inverts WorkingMemory: the cells it allows fit the budget, one
// more does not.
func TestMaxCells(t *testing.T) {
	for _, budget := range []int64{900 << 20, 2 << 30, memoryBase + bytesPerCell - 1, memoryBase + bytesPerCell} {
		n := MaxCells(budget)
		if WorkingMemory(1, int(n)) > budget || WorkingMemory(1, int(n+1)) <= budget {
			t.Errorf("budget %d: MaxCells %d does not invert WorkingMemory", budget, n)
		}
	}
	if n := MaxCells(1 << 20); n != 0 {
		t.Errorf("a budget below the base allows %d cells, want 0", n)
	}
}

// The CSV beside the package is checked, or, when none was sent, the CSV
// inline in the document; a document that is not JSON is left to the
// loader.
func TestCheckPackageMemory(t *testing.T) {
	const inline = `{"data": {"kind": "rows", "csv": "a,b\n1,2\n3,4\n"}}`
	if err := CheckPackageMemory([]byte(inline), nil, 1<<20); ErrorCode(err) != EInvalid {
		t.Errorf("inline CSV over budget: %v", err)
	}
	beside := []byte(`{"data": {"kind": "rows"}}`)
	if err := CheckPackageMemory(beside, []byte("a,b\n1,2\n"), 1<<20); ErrorCode(err) != EInvalid {
		t.Errorf("CSV beside over budget: %v", err)
	}
	if err := CheckPackageMemory([]byte(inline), []byte{}, 1<<30); err != nil {
		t.Errorf("inline CSV within budget: %v", err)
	}
	if err := CheckPackageMemory([]byte("{not json"), nil, 1<<20); err != nil {
		t.Errorf("not JSON: %v", err)
	}
}
