package service

import (
	"crypto/hmac"
	"crypto/sha256"
	"encoding/hex"
	"net/http"
	"testing"
	"time"
)

// HMAC-SHA256 test case 2 of RFC 4231, section 4.3.
func TestMAC_RFC4231(t *testing.T) {
	const want = "5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843"
	if got := mac("Jefe", []byte("what do ya want for nothing?")); got != want {
		t.Fatalf("HMAC %s, want %s", got, want)
	}
}

func TestVerifyWebhook(t *testing.T) {
	at := time.Unix(1_800_000_000, 0)
	body := []byte(`{"status":"done"}`)
	ts, sig := SignWebhook("whsec_x", at, 42, body)
	for _, tc := range []struct {
		name                      string
		secret, ts, delivery, sig string
		body                      string
		now                       time.Time
		want                      bool
	}{
		{"Good", "whsec_x", ts, "42", sig, string(body), at.Add(time.Minute), true},
		{"Old", "whsec_x", ts, "42", sig, string(body), at.Add(time.Hour), false},
		{"OtherBody", "whsec_x", ts, "42", sig, `{"status":"failed"}`, at, false},
		{"OtherSecret", "whsec_y", ts, "42", sig, string(body), at, false},
		{"MovedTimestamp", "whsec_x", "1800000001", "42", sig, string(body), at, false},
		{"OtherDelivery", "whsec_x", ts, "43", sig, string(body), at, false},
		{"NoDelivery", "whsec_x", ts, "", sig, string(body), at, false},
		{"NoScheme", "whsec_x", ts, "42", sig[3:], string(body), at, false},
		{"EarlierScheme", "whsec_x", ts, "42", "v1=" + sig[3:], string(body), at, false},
	} {
		h := http.Header{}
		h.Set(HeaderWebhookTimestamp, tc.ts)
		h.Set(HeaderWebhookDelivery, tc.delivery)
		h.Set(HeaderWebhookSignature, tc.sig)
		id, ok := VerifyWebhook(tc.secret, h, []byte(tc.body), tc.now, 5*time.Minute)
		if ok != tc.want || (ok && id != "42") {
			t.Errorf("%s: %q %v, want %v", tc.name, id, ok, tc.want)
		}
	}
}

// The signed content is the timestamp, the delivery id and the body, each
// joined by a full stop (the README's recipe): an HMAC computed here from
// that recipe, independently of signedContent, matches.
func TestSignWebhook_Recipe(t *testing.T) {
	at := time.Unix(1_800_000_000, 0)
	_, sig := SignWebhook("whsec_x", at, 7, []byte("{}"))
	m := hmac.New(sha256.New, []byte("whsec_x"))
	m.Write([]byte("1800000000.7.{}"))
	if want := "v2=" + hex.EncodeToString(m.Sum(nil)); sig != want {
		t.Fatalf("signature %s, want %s", sig, want)
	}
}
