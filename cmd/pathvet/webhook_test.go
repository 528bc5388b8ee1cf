package main

import (
	"encoding/json"
	"io"
	"net/http"
	"net/http/httptest"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

// receiver is a webhook receiver on loopback: it refuses the first
// request with 503, then takes each one whose signature verifies, and
// acts on a delivery id once (a repeat is answered 204 and ignored), as
// service.VerifyWebhook's contract asks.
type receiver struct {
	mu       sync.Mutex
	secret   string
	calls    int
	ids      []string // the delivery id of every request
	seen     map[string]bool
	verified []map[string]any
	got      chan struct{}
}

func (r *receiver) ServeHTTP(w http.ResponseWriter, req *http.Request) {
	body, _ := io.ReadAll(req.Body)
	r.mu.Lock()
	defer r.mu.Unlock()
	r.calls++
	r.ids = append(r.ids, req.Header.Get(service.HeaderWebhookDelivery))
	if r.calls == 1 {
		w.WriteHeader(http.StatusServiceUnavailable)
		return
	}
	id, ok := service.VerifyWebhook(r.secret, req.Header, body, time.Now(), 5*time.Minute)
	switch {
	case !ok:
		w.WriteHeader(http.StatusUnauthorized)
		return
	case r.seen[id]:
		w.WriteHeader(http.StatusNoContent)
		return
	}
	r.seen[id] = true
	var v map[string]any
	_ = json.Unmarshal(body, &v)
	r.verified = append(r.verified, v)
	w.WriteHeader(http.StatusNoContent)
	r.got <- struct{}{}
}

// An office's webhook gets a signed POST when a screening ends, retried
// through the queue after a refusal with the same delivery id; the
// deliveries show over the API. The receiver is on loopback, so the
// server allows 127.0.0.1 (and only it) with --webhook-allow.
func TestServer_Webhook(t *testing.T) {
	db, url := storetest.MustOpenDB(t)
	m := startMainWith(t, url, func(c *Config) { c.WebhookAllow = "127.0.0.1/32" })
	t.Cleanup(func() { _ = m.Close() })
	base := m.URL()
	editor := apiClient{t, &base, mustKeyToken(t, db, "Office H", service.RoleEditor)}
	submitter := apiClient{t, &base, mustKeyToken(t, db, "Office H", service.RoleSubmitter)}
	rcv := &receiver{got: make(chan struct{}, 4), seen: map[string]bool{}}
	hook := httptest.NewServer(rcv)
	defer hook.Close()

	if code, _, _ := submitter.call(http.MethodPut, "/v1/webhook", "application/json", []byte(`{"url": "`+hook.URL+`"}`)); code != 403 {
		t.Fatalf("a submitter sets the webhook: %d", code)
	}
	checkRefusedWebhooks(t, editor, hook.URL)
	code, _, b := editor.call(http.MethodPut, "/v1/webhook", "application/json", []byte(`{"url": "`+hook.URL+`"}`))
	var wh api.WebhookView
	if json.Unmarshal(b, &wh); code != 200 || wh.Secret == "" || wh.URL != hook.URL {
		t.Fatalf("set webhook: %d %s", code, b)
	}
	rcv.mu.Lock()
	rcv.secret = wh.Secret
	rcv.mu.Unlock()
	var shown api.WebhookView
	if code, _, b := editor.call(http.MethodGet, "/v1/webhook", "", nil); code != 200 || json.Unmarshal(b, &shown) != nil ||
		shown.Secret != "" ||
		shown.URL != hook.URL {
		t.Fatalf("get webhook shows its secret or fails: %d %s", code, b)
	}
	_, _, b = submitter.call(http.MethodPost, "/v1/submissions", "application/json",
		readFile(t, "../../testdata/demo/tutoring-anxiety/package.json"))
	id := submissionID(t, b)
	select {
	case <-rcv.got:
	case <-time.After(2 * time.Minute):
		t.Fatal("no verified delivery within two minutes")
	}
	checkDelivered(t, rcv, editor, id)
	checkOpenAPI(t, m)
}

// checkRefusedWebhooks: URLs whose host is an address deliveries may not
// reach are refused as they are set, naming the class; the allow-list
// lets 127.0.0.1 through and nothing beside it.
func checkRefusedWebhooks(t *testing.T, editor apiClient, hookURL string) {
	t.Helper()
	port := hookURL[strings.LastIndex(hookURL, ":"):]
	for url, class := range map[string]string{
		"ftp://x":                          "http or https",
		"http://127.0.0.2" + port:          "loopback",
		"http://169.254.169.254/latest":    "cloud metadata",
		"http://10.0.0.7/":                 "private",
		"http://[::1]" + port:              "loopback",
		"http://0.0.0.0" + port:            "unspecified",
		"http://[::ffff:169.254.1.1]/hook": "link-local",
	} {
		code, _, b := editor.call(http.MethodPut, "/v1/webhook", "application/json", []byte(`{"url": "`+url+`"}`))
		var p api.Problem
		if json.Unmarshal(b, &p); code != 400 || !strings.Contains(p.Detail, class) {
			t.Errorf("webhook %s: %d %q, want 400 naming %q", url, code, p.Detail, class)
		}
	}
}

func checkDelivered(t *testing.T, rcv *receiver, editor apiClient, id string) {
	t.Helper()
	rcv.mu.Lock()
	v, ids := rcv.verified[0], rcv.ids
	rcv.mu.Unlock()
	if v["submission_id"] != id || v["status"] != service.StatusDone || v["band"] == nil || v["score"] == nil {
		t.Fatalf("payload %v", v)
	}
	var list api.DeliveryList
	for range 50 { // the outcome is recorded just after the answer
		_, _, b := editor.call(http.MethodGet, "/v1/webhook/deliveries", "", nil)
		if json.Unmarshal(b, &list); len(list.Deliveries) == 1 &&
			list.Deliveries[0].Status == service.DeliveryDelivered {
			break
		}
		time.Sleep(100 * time.Millisecond)
	}
	d := list.Deliveries[0]
	if d.Status != service.DeliveryDelivered || d.Attempts != 2 || d.SubmissionID != id || *d.LastStatusCode != 204 {
		t.Fatalf("delivery %+v, want delivered on the second attempt", d)
	}
	want := strconv.FormatInt(d.ID, 10)
	if len(ids) != 2 || ids[0] != want || ids[1] != want {
		t.Fatalf("the requests carried delivery ids %v, want %s on both attempts", ids, want)
	}
	if code, _, _ := editor.call(http.MethodDelete, "/v1/webhook", "", nil); code != 204 {
		t.Fatalf("delete webhook: %d", code)
	}
}
