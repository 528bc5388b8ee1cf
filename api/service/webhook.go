package service

import (
	"crypto/hmac"
	"crypto/sha256"
	"encoding/hex"
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
	HeaderWebhookSignature = "Pathvet-Signature" // "v1=" and the hex HMAC
	HeaderWebhookDelivery  = "Pathvet-Delivery"  // the delivery's id
)

// SignWebhook signs a body sent at a time: HMAC-SHA256 (RFC 2104) under
// the secret of
//
//	timestamp + "." + body
//
// written as "v1=" and lower-case hex. Signing the timestamp with the
// body lets a receiver refuse replays of an old request.
func SignWebhook(secret string, at time.Time, body []byte) (timestamp, signature string) {
	timestamp = strconv.FormatInt(at.Unix(), 10)
	return timestamp, "v1=" + mac(secret, append([]byte(timestamp+"."), body...))
}

// mac is the lower-case hex HMAC-SHA256 of msg under key.
func mac(key string, msg []byte) string {
	m := hmac.New(sha256.New, []byte(key))
	m.Write(msg)
	return hex.EncodeToString(m.Sum(nil))
}

// VerifyWebhook reports whether a request's signature is the secret's for
// its body and timestamp, and the timestamp lies within tolerance of now.
func VerifyWebhook(secret, timestamp, signature string, body []byte, now time.Time, tolerance time.Duration) bool {
	sec, err := strconv.ParseInt(timestamp, 10, 64)
	if err != nil || now.Sub(time.Unix(sec, 0)).Abs() > tolerance || !strings.HasPrefix(signature, "v1=") {
		return false
	}
	_, want := SignWebhook(secret, time.Unix(sec, 0), body)
	return hmac.Equal([]byte(want), []byte(signature))
}
