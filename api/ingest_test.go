package api_test

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"mime/multipart"
	"net"
	"net/http"
	"net/http/httptest"
	"strings"
	"testing"
	"time"

	"github.com/pathvet/pathvet/api"
)

// slowClient opens a connection to ts and sends the headers of a large
// upload by key token, declared at size bytes; send trickles its body.
type slowClient struct {
	conn net.Conn
	r    *bufio.Reader
}

func newSlowClient(t *testing.T, ts *httptest.Server, token string, size int) *slowClient {
	t.Helper()
	conn, err := net.Dial("tcp", ts.Listener.Addr().String())
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { conn.Close() })
	fmt.Fprintf(conn, "POST /v1/submissions HTTP/1.1\r\nHost: pathvet\r\nAuthorization: Bearer %s\r\n"+
		"Content-Type: application/json\r\nContent-Length: %d\r\n\r\n{", token, size)
	return &slowClient{conn: conn, r: bufio.NewReader(conn)}
}

// trickle sends a KiB every interval until the server stops reading
// (the write fails) or stop is closed.
func (c *slowClient) trickle(interval time.Duration, stop <-chan struct{}) {
	chunk := bytes.Repeat([]byte(" "), 1<<10)
	for {
		select {
		case <-stop:
			return
		case <-time.After(interval):
		}
		if _, err := c.conn.Write(chunk); err != nil {
			return
		}
	}
}

// answer reads the server's answer: its status and problem details.
func (c *slowClient) answer(t *testing.T) (int, api.Problem) {
	t.Helper()
	resp, err := http.ReadResponse(c.r, nil)
	if err != nil {
		t.Fatal(err)
	}
	defer resp.Body.Close()
	var p api.Problem
	b, _ := io.ReadAll(resp.Body)
	_ = json.Unmarshal(b, &p)
	return resp.StatusCode, p
}

// postLarge sends a large upload by key token at full speed: a package
// that is not JSON (so that it is refused once it is checked) and a data
// part of LargeIngestBytes.
func postLarge(t *testing.T, ts *httptest.Server, token string) *http.Response {
	t.Helper()
	var body bytes.Buffer
	mw := multipart.NewWriter(&body)
	pw, _ := mw.CreateFormFile("package", "package.json")
	_, _ = pw.Write([]byte("not JSON"))
	dw, _ := mw.CreateFormFile("data", "rows.csv")
	_, _ = dw.Write(bytes.Repeat([]byte("1\n"), api.LargeIngestBytes/2))
	_ = mw.Close()
	req, _ := http.NewRequest(http.MethodPost, ts.URL+"/v1/submissions", &body)
	req.Header.Set("Authorization", "Bearer "+token)
	req.Header.Set("Content-Type", mw.FormDataContentType())
	resp, err := http.DefaultClient.Do(req)
	if err != nil {
		t.Fatal(err)
	}
	_, _ = io.Copy(io.Discard, resp.Body)
	resp.Body.Close()
	return resp
}

// A large upload that trickles in over loopback (1 KiB every 100 ms, about
// 10 KiB/s) holds no slot while it arrives: another office's large upload
// goes through and is checked meanwhile (before, it was 503 until the
// trickle ended), a second large upload by the slow key is 429 with
// Retry-After, and the trickle is cut once the grace is over, 408, with a
// sentence that says why.
func TestIngest_SlowClientHoldsNoSlot(t *testing.T) {
	srv := api.New(api.Config{Store: &fakeStore{}, LargeIngests: 1,
		UploadGrace: 5 * time.Second, UploadMinRate: 64 << 10, UploadIdle: 5 * time.Second})
	ts := httptest.NewServer(srv.Echo())
	defer ts.Close()
	slow := newSlowClient(t, ts, "good", 2*api.LargeIngestBytes)
	stop := make(chan struct{})
	defer close(stop)
	go slow.trickle(100*time.Millisecond, stop)
	var own *http.Response
	for range 50 { // until the server has taken the slow upload's headers
		if own = postLarge(t, ts, "good"); own.StatusCode == http.StatusTooManyRequests {
			break
		}
		time.Sleep(20 * time.Millisecond)
	}
	if own.StatusCode != http.StatusTooManyRequests || own.Header.Get("Retry-After") == "" {
		t.Fatalf("a second large upload by the slow key: %d %v", own.StatusCode, own.Header)
	}
	if other := postLarge(t, ts, "other"); other.StatusCode != http.StatusUnprocessableEntity {
		t.Fatalf("another office's large upload during the trickle: %d, want 422 (checked)", other.StatusCode)
	}
	code, p := slow.answer(t)
	slow.conn.Close()
	if code != http.StatusRequestTimeout || !strings.Contains(p.Detail, "slower than 65536 bytes a second") {
		t.Fatalf("the slow upload: %d %+v", code, p)
	}
}

// A client that sends the headers of an upload and then nothing is cut
// when a read has waited UploadIdle, 408, not held until the server's
// read timeout of minutes.
func TestIngest_StalledUploadCut(t *testing.T) {
	srv := api.New(api.Config{Store: &fakeStore{}, UploadGrace: time.Minute, UploadIdle: 300 * time.Millisecond})
	ts := httptest.NewServer(srv.Echo())
	defer ts.Close()
	stalled := newSlowClient(t, ts, "good", 1000)
	code, p := stalled.answer(t)
	stalled.conn.Close()
	if code != http.StatusRequestTimeout || !strings.Contains(p.Detail, "stopped for 300ms") {
		t.Fatalf("a stalled upload: %d %+v", code, p)
	}
}
