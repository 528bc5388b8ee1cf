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
		clean, score := separatorScore(lines, sep)
		if clean > bestClean || clean == bestClean && score > bestScore {
			best, bestClean, bestScore = sep, clean, score
		}
	}
	return best
}

// separatorScore counts the lines that read as clean rows under sep, and
// the rows' values less their words.
func separatorScore(lines []line, sep separator) (clean, score int) {
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
	return clean, score
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
		if rw := parseRow(l, sep, 0, false); rw.dataLike() {
			c, p := decimalVotes(rw.values())
			comma, point = comma+c, point+p
		}
	}
	if comma > point {
		return ','
	}
	return '.'
}

// decimalVotes counts the cells that read as numbers only with a decimal
// comma, and only with a point.
func decimalVotes(cells []cell) (comma, point int) {
	for _, c := range cells {
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
	return comma, point
}
