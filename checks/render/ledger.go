package render

import "github.com/pathvet/pathvet/checks"

// LedgerLine is one check's deduction from the score.
type LedgerLine struct {
	Title, Status string
	Deduction     int
	Running       int // the score after this line
}

// Ledger is the score as 100 minus each check's deduction, in the
// order the checks ran.
type Ledger struct {
	Lines []LedgerLine
	Score int
	Band  string
	// Floored: the deductions add up to more than 100 and the score
	// stops at zero.
	Floored bool
	// Cap says why the score was capped below what the deductions leave
	// (checks.ScoreCap); empty when it was not.
	Cap string
}

func ledger(r *checks.Report) Ledger {
	l := Ledger{Score: r.Score, Band: bandWords(r.Band)}
	run := 100
	for _, c := range r.Checks {
		run -= c.Deduction
		l.Lines = append(l.Lines, LedgerLine{Title: c.Title, Status: statusWords(c.Status),
			Deduction: c.Deduction, Running: run})
	}
	l.Floored = run < 0
	if r.ScoreCap != nil {
		l.Cap = r.ScoreCap.Reason
	}
	return l
}
