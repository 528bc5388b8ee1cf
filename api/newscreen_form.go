package api

import (
	"encoding/base64"
	"errors"
	"fmt"
	"io"
	"mime/multipart"
	"net/http"
	"net/url"
	"slices"
	"strconv"
	"strings"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/render"
)

// formRowsBytes bounds raw rows sent through the form (each cell is held
// as text while its column is guessed); keptRowsBytes bounds the rows the
// page itself keeps between steps, base64 in a hidden field.
const (
	formRowsBytes = 16 << 20
	keptRowsBytes = 2 << 20
)

// screenForm is the new-screening form as posted.
type screenForm struct {
	Title, ManuscriptID, Design, MissingMethod string
	Table, N, Arrows                           string
	Claims                                     []claimRow
	// Key is the form's idempotency key; From the earlier version's id.
	Key, From string
	// Rows are the raw rows in use, if any; rowsDrop: the user ticked "do
	// not use these rows"; rowsErr says why an upload was not taken.
	Rows     *formRows
	rowsDrop bool
	rowsErr  string
	focus    int // the claim row to put the cursor in, 0 for none
}

// claimRow is one claim row as posted.
type claimRow struct {
	ID, Text, Kind, From, To, Estimate, CILow, CIHigh, P string
	Headline                                             bool
}

func (r claimRow) blank() bool {
	return strings.TrimSpace(r.ID+r.Text+r.From+r.To+r.Estimate+r.CILow+r.CIHigh+r.P) == "" && !r.Headline
}

// formRows are raw rows: an upload, kept from an earlier step of the form,
// or the earlier version's.
type formRows struct {
	Name    string
	Data    []byte
	Earlier bool
}

// readForm reads the posted form whole (multipart, or URL-encoded when
// nothing is attached; files past 32 MiB wait on disk) before its token
// is checked: an upload that breaks the upload rules is refused as the
// API refuses one (408), and the read deadline is lifted once it is in.
func (s *Server) readForm(next echo.HandlerFunc) echo.HandlerFunc {
	return func(c echo.Context) error {
		err := c.Request().ParseMultipartForm(32 << 20)
		switch {
		case errors.Is(err, errTooSlow):
			return s.tooSlow(c)
		case err != nil && !errors.Is(err, http.ErrNotMultipart):
			return bodyError(err)
		}
		bodyRead(c)
		return next(c)
	}
}

// readScreenForm reads the fields of the form readForm parsed.
func (s *Server) readScreenForm(c echo.Context) (*screenForm, error) {
	r := c.Request()
	v := r.PostForm
	f := &screenForm{Title: v.Get("title"), ManuscriptID: v.Get("manuscript_id"), Design: v.Get("design"),
		MissingMethod: v.Get("missing_method"), Table: v.Get("table"), N: v.Get("n"), Arrows: v.Get("arrows"),
		Key: v.Get("idempotency_key"), From: v.Get("from"), Claims: readClaimRows(v),
		rowsDrop: v.Get("rows_drop") != ""}
	if err := checkIdempotencyKey(f.idempotencyKey(), "form's idempotency key"); err != nil {
		return nil, err
	}
	return f, f.readRows(r)
}

// readClaimRows reads the claim rows: each field once a row, in order;
// a headline box sends its row's number.
func readClaimRows(v url.Values) []claimRow {
	n := 0
	for _, k := range []string{"claim_id", "claim_text", "claim_kind", "claim_from", "claim_to"} {
		n = max(n, len(v[k]))
	}
	n = min(n, maxFormClaims)
	at := func(k string, i int) string {
		if i < len(v[k]) {
			return v[k][i]
		}
		return ""
	}
	rows := make([]claimRow, n)
	for i := range rows {
		rows[i] = claimRow{ID: at("claim_id", i), Text: at("claim_text", i), Kind: at("claim_kind", i),
			From: at("claim_from", i), To: at("claim_to", i), Estimate: at("claim_estimate", i),
			CILow: at("claim_ci_low", i), CIHigh: at("claim_ci_high", i), P: at("claim_p", i),
			Headline: slices.Contains(v["claim_headline"], strconv.Itoa(i+1))}
	}
	if len(rows) == 0 {
		rows = []claimRow{{Kind: checks.KindDirect}}
	}
	return rows
}

// readRows takes the attached file, else the rows the page kept.
func (f *screenForm) readRows(r *http.Request) error {
	if r.MultipartForm != nil {
		if fh := r.MultipartForm.File["rows_file"]; len(fh) > 0 && fh[0].Size > 0 {
			return f.readUpload(fh[0])
		}
	}
	if kept := r.PostForm.Get("rows_kept"); kept != "" && !f.rowsDrop {
		b, err := base64.StdEncoding.DecodeString(kept)
		if err != nil {
			return problemError(http.StatusBadRequest, "The rows the form kept do not decode (rows_kept).")
		}
		f.Rows = &formRows{Name: r.PostForm.Get("rows_name"), Data: b}
	}
	return nil
}

// Messages of the raw rows.
const msgRowsTooLarge = "%s is %s; the form takes raw rows up to %s. Send larger data through the API " +
	"(a multipart upload), or start from pathvet init --data."

// readUpload reads an attached CSV, when it is not too large for the form.
func (f *screenForm) readUpload(fh *multipart.FileHeader) error {
	if fh.Size > formRowsBytes {
		f.rowsErr = fmt.Sprintf(msgRowsTooLarge, fh.Filename, sizeWords(fh.Size), sizeWords(formRowsBytes))
		return nil
	}
	file, err := fh.Open()
	if err != nil {
		return fmt.Errorf("api: open the uploaded rows: %w", err)
	}
	defer file.Close()
	b, err := io.ReadAll(file)
	f.Rows = &formRows{Name: fh.Filename, Data: b}
	return err
}

// useEarlier takes the earlier version's rows when nothing else is
// attached and the user did not drop them.
func (f *screenForm) useEarlier(e *earlierVersion) {
	if f.Rows == nil && !f.rowsDrop && f.rowsErr == "" && e != nil && e.rows != nil {
		f.Rows = &formRows{Name: "the earlier version's rows", Data: e.rows, Earlier: true}
	}
}

// size is what the form hands the checks: the table's text and the rows.
func (f *screenForm) size() int64 {
	n := int64(len(f.Table))
	if f.Rows != nil {
		n += int64(len(f.Rows.Data))
	}
	return n
}

// idempotencyKey is the key the store sees: the form's, marked as the
// workspace's so that it cannot meet a key an API client chose.
func (f *screenForm) idempotencyKey() string {
	if f.Key == "" {
		return ""
	}
	return "web:" + f.Key
}

// view is the form as the page shows it again.
func (f *screenForm) view(csrf string, b *built) render.ScreenForm {
	v := render.ScreenForm{CSRF: csrf, Key: f.Key, From: f.From, Title: f.Title, ManuscriptID: f.ManuscriptID,
		Design: f.Design, MissingMethod: f.MissingMethod, Table: f.Table, N: f.N, Arrows: f.Arrows,
		Errors: b.errs.by}
	for i, r := range f.Claims {
		v.Claims = append(v.Claims, render.ClaimInput{N: i + 1, ID: r.ID, Text: r.Text, Kind: r.Kind, From: r.From,
			To: r.To, Estimate: r.Estimate, CILow: r.CILow, CIHigh: r.CIHigh, P: r.P, Headline: r.Headline})
	}
	if f.focus > 0 {
		v.Focus = fmt.Sprintf("c%d-id", f.focus)
	}
	n := 0
	if b.rows != nil {
		n = b.rows.N
	}
	v.Rows = f.Rows.view(n)
	return v
}

// view says which rows are in use (n of them, 0 when not known) and
// keeps an upload in the page when it is small enough.
func (r *formRows) view(n int) *render.KeptRows {
	if r == nil {
		return nil
	}
	k := &render.KeptRows{Name: r.Name, Size: sizeWords(int64(len(r.Data))), Earlier: r.Earlier, Rows: n}
	switch {
	case r.Earlier:
	case len(r.Data) <= keptRowsBytes:
		k.Data = base64.StdEncoding.EncodeToString(r.Data)
	default:
		k.NotKept = sizeWords(keptRowsBytes)
	}
	return k
}

// sizeWords is a size in bytes, KB or MB (1,024-based, as file managers
// show them).
func sizeWords(n int64) string {
	switch {
	case n < 1<<10:
		return fmt.Sprintf("%d bytes", n)
	case n < 1<<20:
		return fmt.Sprintf("%.0f KB", float64(n)/(1<<10))
	}
	return fmt.Sprintf("%.1f MB", float64(n)/(1<<20))
}
