package service

import (
	"crypto/hmac"
	"crypto/sha256"
	"encoding/hex"
	"net/http"
	"strconv"
	"strings"
	"time"
)

// Webhook is where an office is told that a screening ended.
type Webhook struct {
	OfficeID  int64
	URL       string
	Secret    string // shown once, when the webhook is set
	CreatedAt time.Time
}

// Delivery statuses.
const (
	DeliveryPending   = "pending"
	DeliveryDelivered = "delivered"
	DeliveryFailed    = "failed"
)

// Delivery is one notification and its outcome.
type Delivery struct {
	ID             int64
	SubmissionID   string
	Status         string
	Attempts       int
	LastStatusCode *int
	LastError      string
	CreatedAt      time.Time
	FinishedAt     *time.Time
}

// Headers of a webhook request.
const (
	HeaderWebhookTimestamp = "Pathvet-Timestamp" // Unix seconds when it was signed
	HeaderWebhookSignature = "Pathvet-Signature" // "v2=" and the hex HMAC
	HeaderWebhookDelivery  = "Pathvet-Delivery"  // the delivery's id, the same on every retry
)

// SignWebhook signs a delivery's body sent at a time: HMAC-SHA256 (RFC
// 2104) under the secret of
//
//	timestamp + "." + delivery id + "." + body
//
// written as "v2=" and lower-case hex. The timestamp lets a receiver
// refuse an old request; the delivery id, signed with it, lets it refuse
// a repeated one.
func SignWebhook(secret string, at time.Time, delivery int64, body []byte) (timestamp, signature string) {
	timestamp = strconv.FormatInt(at.Unix(), 10)
	return timestamp, "v2=" + mac(secret, signedContent(timestamp, strconv.FormatInt(delivery, 10), body))
}

func signedContent(timestamp, delivery string, body []byte) []byte {
	return append([]byte(timestamp+"."+delivery+"."), body...)
}

// mac is the lower-case hex HMAC-SHA256 of msg under key.
func mac(key string, msg []byte) string {
	m := hmac.New(sha256.New, []byte(key))
	m.Write(msg)
	return hex.EncodeToString(m.Sum(nil))
}

// VerifyWebhook checks a webhook request's headers and body: the
// signature must be the secret's for its timestamp, delivery id and body,
// and the timestamp within tolerance of now. It returns the delivery id
// and whether the request passed.
//
// A request that passes may still be a repeat: a copy replayed within the
// tolerance, or a retry of a delivery whose 2xx answer was lost (retries
// keep the id, and span about 1.3 hours). A receiver must therefore
// reject a delivery id it has already acted on: keep each id for at least
// two hours and never act on one twice (answer a repeat with 2xx, so that
// the retries stop, but do nothing).
func VerifyWebhook(secret string, h http.Header, body []byte, now time.Time, tolerance time.Duration) (string, bool) {
	ts, delivery, sig := h.Get(HeaderWebhookTimestamp), h.Get(HeaderWebhookDelivery), h.Get(HeaderWebhookSignature)
	sec, err := strconv.ParseInt(ts, 10, 64)
	if err != nil || now.Sub(time.Unix(sec, 0)).Abs() > tolerance || !strings.HasPrefix(sig, "v2=") ||
		delivery == "" {
		return "", false
	}
	want := "v2=" + mac(secret, signedContent(ts, delivery, body))
	return delivery, hmac.Equal([]byte(want), []byte(sig))
}
