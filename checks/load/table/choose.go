package table

import "strings"

// sampleLines is how many lines the separator and the decimal mark are
// chosen by: more than a table's title, header and first rows.
const sampleLines = 100

// chooseSeparator takes the separator under which most lines read as clean
// rows (values and no words after the label), then the one that reads the
// most values; ties go to the first of tabs, semicolons, commas, wide and
// single spaces. The first sampleLines lines are read. Single spaces are not tried when runs of spaces or tabs
// cut at least half the lines into cells: words there belong to cells
// rather than to labels.
func chooseSeparator(lines []line) separator {
	lines = lines[:min(len(lines), sampleLines)]
	best, bestClean, bestScore := tabs, -1, 0
	for _, sep := range separators {
		if sep == singleSpaces && wideText(lines) {
			continue
		}
		clean, score := 0, 0
		for _, l := range lines {
			kind, rw := lineKind(l, sep, 0)
			if kind != lineData {
				continue
			}
			values, words := rw.counts()
			if values > 0 && words == 0 {
				clean++
			}
			score += values - words
		}
		if clean > bestClean || clean == bestClean && score > bestScore {
			best, bestClean, bestScore = sep, clean, score
		}
	}
	return best
}

// wideText reports whether runs of spaces or tabs cut at least half the
// lines into two or more cells.
func wideText(lines []line) bool {
	cut := 0
	for _, l := range lines {
		if strings.Contains(l.text, "  ") || strings.Contains(l.text, "\t") {
			cut++
		}
	}
	return 2*cut >= len(lines)
}

// chooseDecimal is ',' when the separator is not a comma and more of the
// rows' numbers read only with a decimal comma than only with a point
// (among the first sampleLines lines).
func chooseDecimal(lines []line, sep separator) byte {
	if sep == commas {
		return '.'
	}
	lines = lines[:min(len(lines), sampleLines)]
	comma, point := 0, 0
	for _, l := range lines {
		rw := parseRow(l, sep, 0, false)
		if !rw.dataLike() {
			continue
		}
		for _, c := range rw.values() {
			if !strings.ContainsAny(c.text, ".,") {
				continue
			}
			_, okPoint := parseCell(c.text, 0, '.').number()
			_, okComma := parseCell(c.text, 0, ',').number()
			switch {
			case okComma && !okPoint:
				comma++
			case okPoint && !okComma:
				point++
			}
		}
	}
	if comma > point {
		return ','
	}
	return '.'
}
