package main

import (
	"bytes"
	"compress/zlib"
	"fmt"
	"io"
	"regexp"
	"strconv"
)

// A reader of the PDF that Chromium's printing writes (Skia's writer:
// plain objects, one Flate content stream a page), just far enough to say
// how many pages there are, which way each is turned, and where on it
// each run of text stands and in which font. It follows the PDF 1.7
// reference (ISO 32000-1): the page tree (§7.7.3), the content stream's
// graphics state and text operators (§8.4.4 q/Q/cm, §9.4 BT/Tm/Td/Tf/Tj).

type pdfPage struct {
	W, H float64   // the MediaBox, in points
	Runs []textRun // every text-showing operation, in page space
}

type textRun struct {
	X, Y float64 // where the run starts; Y grows upwards from the bottom
	Font string  // the font's BaseFont, e.g. "DejaVuSerif-Bold"
}

var (
	pdfObject   = regexp.MustCompile(`(?s)(\d+) 0 obj\s*(.*?)endobj`)
	pdfKids     = regexp.MustCompile(`/Kids\s*\[([^\]]*)\]`)
	pdfRef      = regexp.MustCompile(`(\d+) 0 R`)
	pdfMediaBox = regexp.MustCompile(`/MediaBox\s*\[\s*([-\d.]+)\s+([-\d.]+)\s+([-\d.]+)\s+([-\d.]+)\s*\]`)
	pdfContents = regexp.MustCompile(`/Contents\s*(\[[^\]]*\]|\d+ 0 R)`)
	pdfFontDict = regexp.MustCompile(`/Font\s*<<((?:[^<>]|<[^<])*?)>>`)
	pdfFontRef  = regexp.MustCompile(`/(\w+)\s+(\d+) 0 R`)
	pdfBaseFont = regexp.MustCompile(`/BaseFont\s*/([^\s/<>\[\]]+)`)
	pdfStream   = regexp.MustCompile(`(?s)^<<(.*?)>>\s*stream\r?\n`)
)

// readPDF returns the pages of a PDF in their order.
func readPDF(b []byte) ([]pdfPage, error) {
	objs := map[string][]byte{}
	for _, m := range pdfObject.FindAllSubmatch(b, -1) {
		objs[string(m[1])] = m[2]
	}
	var root string
	for id, o := range objs {
		if bytes.Contains(o, []byte("/Type /Pages")) && !bytes.Contains(o, []byte("/Parent")) {
			root = id
		}
	}
	if root == "" {
		return nil, fmt.Errorf("no page tree")
	}
	var pages []pdfPage
	var walk func(id string) error
	walk = func(id string) error {
		o := objs[id]
		if kids := pdfKids.FindSubmatch(o); kids != nil {
			for _, r := range pdfRef.FindAllSubmatch(kids[1], -1) {
				if err := walk(string(r[1])); err != nil {
					return err
				}
			}
			return nil
		}
		p, err := readPage(objs, o)
		pages = append(pages, p)
		return err
	}
	return pages, walk(root)
}

func readPage(objs map[string][]byte, o []byte) (pdfPage, error) {
	var p pdfPage
	box := pdfMediaBox.FindSubmatch(o)
	if box == nil {
		return p, fmt.Errorf("a page without a MediaBox")
	}
	x0, _ := strconv.ParseFloat(string(box[1]), 64)
	y0, _ := strconv.ParseFloat(string(box[2]), 64)
	x1, _ := strconv.ParseFloat(string(box[3]), 64)
	y1, _ := strconv.ParseFloat(string(box[4]), 64)
	p.W, p.H = x1-x0, y1-y0
	fonts := map[string]string{}
	if d := pdfFontDict.FindSubmatch(o); d != nil {
		for _, f := range pdfFontRef.FindAllSubmatch(d[1], -1) {
			if bf := pdfBaseFont.FindSubmatch(objs[string(f[2])]); bf != nil {
				fonts[string(f[1])] = string(bf[1])
			}
		}
	}
	c := pdfContents.FindSubmatch(o)
	if c == nil {
		return p, nil
	}
	for _, r := range pdfRef.FindAllSubmatch(c[1], -1) {
		data, err := streamData(objs[string(r[1])])
		if err != nil {
			return p, err
		}
		p.Runs = append(p.Runs, textRuns(data, fonts)...)
	}
	return p, nil
}

// streamData inflates a content stream.
func streamData(o []byte) ([]byte, error) {
	m := pdfStream.FindSubmatchIndex(o)
	if m == nil {
		return nil, fmt.Errorf("not a stream")
	}
	body := o[m[1]:]
	if i := bytes.LastIndex(body, []byte("endstream")); i >= 0 {
		body = body[:i]
	}
	if !bytes.Contains(o[m[2]:m[3]], []byte("/FlateDecode")) {
		return body, nil
	}
	zr, err := zlib.NewReader(bytes.NewReader(body))
	if err != nil {
		return nil, err
	}
	return io.ReadAll(zr)
}

// matrix is a PDF transformation [a b c d e f]: (x, y) → (ax + cy + e, bx + dy + f).
type matrix [6]float64

var identity = matrix{1, 0, 0, 1, 0, 0}

// times is m applied first, then n.
func (m matrix) times(n matrix) matrix {
	return matrix{m[0]*n[0] + m[1]*n[2], m[0]*n[1] + m[1]*n[3], m[2]*n[0] + m[3]*n[2], m[2]*n[1] + m[3]*n[3],
		m[4]*n[0] + m[5]*n[2] + n[4], m[4]*n[1] + m[5]*n[3] + n[5]}
}

// textState is the part of a content stream's state the text runs need:
// the transformation, the text matrices and the font, and the q stack.
type textState struct {
	ctm, tm, tlm matrix
	font         string
	stack        []savedState // q saves the transformation and the font, Q restores them
	fonts        map[string]string
	runs         []textRun
}

type savedState struct {
	ctm  matrix
	font string
}

// textRuns runs a content stream's graphics and text state and returns
// where each text-showing operator puts its text.
func textRuns(data []byte, fonts map[string]string) []textRun {
	st := &textState{ctm: identity, tm: identity, tlm: identity, fonts: fonts}
	var nums []float64
	var name string
	for _, tok := range pdfTokens(data) {
		switch {
		case tok.num:
			nums = append(nums, tok.val)
		case tok.name:
			name = tok.text
		case !tok.operand:
			st.apply(tok.text, nums, name)
			nums = nums[:0]
		}
	}
	return st.runs
}

// apply runs one operator with its numeric operands and the last name.
func (s *textState) apply(op string, nums []float64, name string) {
	var m matrix
	six := len(nums) >= 6
	if six {
		copy(m[:], nums[len(nums)-6:])
	}
	switch {
	case op == "q":
		s.stack = append(s.stack, savedState{s.ctm, s.font})
	case op == "Q" && len(s.stack) > 0:
		last := s.stack[len(s.stack)-1]
		s.ctm, s.font, s.stack = last.ctm, last.font, s.stack[:len(s.stack)-1]
	case op == "cm" && six:
		s.ctm = m.times(s.ctm)
	case op == "BT":
		s.tm, s.tlm = identity, identity
	case op == "Tm" && six:
		s.tm, s.tlm = m, m
	case (op == "Td" || op == "TD") && len(nums) >= 2:
		s.tlm = matrix{1, 0, 0, 1, nums[len(nums)-2], nums[len(nums)-1]}.times(s.tlm)
		s.tm = s.tlm
	case op == "Tf":
		s.font = s.fonts[name]
	case op == "Tj" || op == "TJ" || op == "'" || op == "\"":
		at := s.tm.times(s.ctm)
		s.runs = append(s.runs, textRun{X: at[4], Y: at[5], Font: s.font})
	}
}

type pdfToken struct {
	text               string
	val                float64
	num, name, operand bool // operand: a string, array or dictionary bracket
}

// pdfTokens splits a content stream into numbers, names, operands that
// are not numbers (strings, brackets) and operators.
func pdfTokens(b []byte) []pdfToken {
	var out []pdfToken
	for i := 0; i < len(b); {
		c := b[i]
		switch {
		case c == ' ' || c == '\n' || c == '\r' || c == '\t' || c == '\f' || c == 0:
			i++
		case c == '%':
			for i < len(b) && b[i] != '\n' {
				i++
			}
		case c == '(':
			i = skipLiteral(b, i)
			out = append(out, pdfToken{operand: true})
		case c == '<' && i+1 < len(b) && b[i+1] == '<', c == '>' && i+1 < len(b) && b[i+1] == '>':
			i += 2
			out = append(out, pdfToken{operand: true})
		case c == '<':
			for i < len(b) && b[i] != '>' {
				i++
			}
			i++
			out = append(out, pdfToken{operand: true})
		case c == '[' || c == ']' || c == '{' || c == '}':
			i++
			out = append(out, pdfToken{operand: true})
		case c == '/':
			j := i + 1
			for j < len(b) && !pdfDelimiter(b[j]) {
				j++
			}
			out = append(out, pdfToken{text: string(b[i+1 : j]), name: true})
			i = j
		default:
			j := i
			for j < len(b) && !pdfDelimiter(b[j]) {
				j++
			}
			if j == i {
				j++
			}
			word := string(b[i:j])
			if v, err := strconv.ParseFloat(word, 64); err == nil {
				out = append(out, pdfToken{val: v, num: true})
			} else {
				out = append(out, pdfToken{text: word})
			}
			i = j
		}
	}
	return out
}

func pdfDelimiter(c byte) bool {
	return bytes.IndexByte([]byte(" \n\r\t\f\x00()<>[]{}/%"), c) >= 0
}

// skipLiteral returns the index after the literal string starting at i,
// with its nested brackets and escapes.
func skipLiteral(b []byte, i int) int {
	depth := 0
	for ; i < len(b); i++ {
		switch b[i] {
		case '\\':
			i++
		case '(':
			depth++
		case ')':
			if depth--; depth == 0 {
				return i + 1
			}
		}
	}
	return i
}
