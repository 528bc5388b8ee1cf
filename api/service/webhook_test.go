package service

import (
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
	ts, sig := SignWebhook("whsec_x", at, body)
	for _, tc := range []struct {
		name            string
		secret, ts, sig string
		body            string
		now             time.Time
		want            bool
	}{
		{"Good", "whsec_x", ts, sig, string(body), at.Add(time.Minute), true},
		{"Replayed", "whsec_x", ts, sig, string(body), at.Add(time.Hour), false},
		{"OtherBody", "whsec_x", ts, sig, `{"status":"failed"}`, at, false},
		{"OtherSecret", "whsec_y", ts, sig, string(body), at, false},
		{"MovedTimestamp", "whsec_x", "1800000001", sig, string(body), at, false},
		{"NoScheme", "whsec_x", ts, sig[3:], string(body), at, false},
	} {
		if got := VerifyWebhook(tc.secret, tc.ts, tc.sig, []byte(tc.body), tc.now, 5*time.Minute); got != tc.want {
			t.Errorf("%s: %v, want %v", tc.name, got, tc.want)
		}
	}
}
