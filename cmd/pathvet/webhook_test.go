package main

import (
	"encoding/json"
	"io"
	"net/http"
	"net/http/httptest"
	"sync"
	"testing"
	"time"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

// receiver is a webhook receiver on loopback: it refuses the first
// request with 503, then takes each one whose signature verifies.
type receiver struct {
	mu       sync.Mutex
	secret   string
	calls    int
	verified []map[string]any
	got      chan struct{}
}

func (r *receiver) ServeHTTP(w http.ResponseWriter, req *http.Request) {
	body, _ := io.ReadAll(req.Body)
	r.mu.Lock()
	defer r.mu.Unlock()
	r.calls++
	if r.calls == 1 {
		w.WriteHeader(http.StatusServiceUnavailable)
		return
	}
	if !service.VerifyWebhook(r.secret, req.Header.Get(service.HeaderWebhookTimestamp),
		req.Header.Get(service.HeaderWebhookSignature), body, time.Now(), 5*time.Minute) {
		w.WriteHeader(http.StatusUnauthorized)
		return
	}
	var v map[string]any
	_ = json.Unmarshal(body, &v)
	r.verified = append(r.verified, v)
	w.WriteHeader(http.StatusNoContent)
	r.got <- struct{}{}
}

// An office's webhook gets a signed POST when a screening ends, retried
// through the queue after a refusal; the deliveries show over the API.
func TestServer_Webhook(t *testing.T) {
	db, url := storetest.MustOpenDB(t)
	m := startMain(t, url)
	t.Cleanup(func() { _ = m.Close() })
	base := m.URL()
	editor := apiClient{t, &base, mustKeyToken(t, db, "Office H", service.RoleEditor)}
	submitter := apiClient{t, &base, mustKeyToken(t, db, "Office H", service.RoleSubmitter)}
	rcv := &receiver{got: make(chan struct{}, 4)}
	hook := httptest.NewServer(rcv)
	defer hook.Close()

	if code, _, _ := submitter.call(http.MethodPut, "/v1/webhook", "application/json", []byte(`{"url": "`+hook.URL+`"}`)); code != 403 {
		t.Fatalf("a submitter sets the webhook: %d", code)
	}
	if code, _, _ := editor.call(http.MethodPut, "/v1/webhook", "application/json", []byte(`{"url": "ftp://x"}`)); code != 400 {
		t.Fatalf("a bad URL: %d", code)
	}
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

func checkDelivered(t *testing.T, rcv *receiver, editor apiClient, id string) {
	t.Helper()
	rcv.mu.Lock()
	v := rcv.verified[0]
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
	if code, _, _ := editor.call(http.MethodDelete, "/v1/webhook", "", nil); code != 204 {
		t.Fatalf("delete webhook: %d", code)
	}
}
