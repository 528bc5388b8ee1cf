package main

import (
	"bytes"
	"html"
	"io"
	"mime/multipart"
	"net/http"
	"regexp"
	"strings"
	"testing"
)

// field is one form field as a browser sends it, in the form's order.
type field struct{ name, value string }

// postMultipart posts fields (and a file for rows_file, when content is
// not nil) as multipart/form-data, as the form's enctype makes a browser
// do.
func (w *webClient) postMultipart(path string, fields []field, fileName string, content []byte) (
	int, http.Header, string) {
	w.t.Helper()
	var body bytes.Buffer
	mw := multipart.NewWriter(&body)
	for _, f := range fields {
		mw.WriteField(f.name, f.value)
	}
	if content != nil {
		fw, _ := mw.CreateFormFile("rows_file", fileName)
		fw.Write(content)
	}
	mw.Close()
	req, _ := http.NewRequest(http.MethodPost, w.base+path, &body)
	req.Header.Set("Content-Type", mw.FormDataContentType())
	resp, err := w.http.Do(req)
	if err != nil {
		w.t.Fatal(err)
	}
	defer resp.Body.Close()
	b, _ := io.ReadAll(resp.Body)
	return resp.StatusCode, resp.Header, string(b)
}

var (
	screenFormRE = regexp.MustCompile(`(?s)<form[^>]*id="screen-form"[^>]*>(.*?)</form>`)
	blankRowRE   = regexp.MustCompile(`(?s)<template id="claim-template">.*?</template>`)
	controlRE    = regexp.MustCompile(`(?s)<input\b[^>]*>|<textarea\b[^>]*>.*?</textarea>|<select\b[^>]*>.*?</select>`)
	nameAttrRE   = regexp.MustCompile(`\sname="([^"]*)"`)
	valueAttrRE  = regexp.MustCompile(`\svalue="([^"]*)"`)
	typeAttrRE   = regexp.MustCompile(`\stype="([^"]*)"`)
	textareaRE   = regexp.MustCompile(`(?s)>(.*)</textarea>`)
	selectedRE   = regexp.MustCompile(`<option value="([^"]*)" selected>`)
	firstOptRE   = regexp.MustCompile(`<option value="([^"]*)"`)
	packageRE    = regexp.MustCompile(`(?s)<pre id="package-json">(.*?)</pre>`)
)

// formFields are the fields the new-screening page's form sends as it
// stands, in order (what a browser sends when a button is pressed,
// without the button): hidden and text inputs, ticked boxes, textareas,
// and each select's chosen option; the blank row the script copies is
// not part of the form.
func formFields(t *testing.T, page string) []field {
	t.Helper()
	m := screenFormRE.FindStringSubmatch(page)
	if m == nil {
		t.Fatalf("no new-screening form in %.400s", page)
	}
	var out []field
	for _, c := range controlRE.FindAllString(blankRowRE.ReplaceAllString(m[1], ""), -1) {
		name := attr(nameAttrRE, c)
		switch {
		case name == "":
		case strings.HasPrefix(c, "<textarea"):
			out = append(out, field{name, html.UnescapeString(attr(textareaRE, c))})
		case strings.HasPrefix(c, "<select"):
			v := attr(selectedRE, c)
			if !selectedRE.MatchString(c) {
				v = attr(firstOptRE, c)
			}
			out = append(out, field{name, html.UnescapeString(v)})
		case attr(typeAttrRE, c) == "file":
		case attr(typeAttrRE, c) == "checkbox" && !strings.Contains(c, " checked"):
		default:
			out = append(out, field{name, html.UnescapeString(attr(valueAttrRE, c))})
		}
	}
	return out
}

func attr(re *regexp.Regexp, s string) string {
	if m := re.FindStringSubmatch(s); m != nil {
		return m[1]
	}
	return ""
}

// with returns fields with the first field of the name set to value
// (added at the end when there is none), and a button's action.
func with(fields []field, kv ...string) []field {
	out := append([]field(nil), fields...)
	for i := 0; i+1 < len(kv); i += 2 {
		found := false
		for j := range out {
			if out[j].name == kv[i] {
				out[j].value, found = kv[i+1], true
				break
			}
		}
		if !found {
			out = append(out, field{kv[i], kv[i+1]})
		}
	}
	return out
}

// previewPackage is the package JSON a preview page shows.
func previewPackage(t *testing.T, page string) []byte {
	t.Helper()
	m := packageRE.FindStringSubmatch(page)
	if m == nil {
		t.Fatalf("no package on the preview page: %.600s", page)
	}
	return []byte(html.UnescapeString(m[1]))
}
