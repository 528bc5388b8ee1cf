package main

import (
	"flag"
	"fmt"
	"io"
	"net/http"
	"os"
	"slices"
	"sync"
	"time"
)

// runLoad sends GETs from c goroutines for d (after a second's warm-up)
// and prints the rate and latencies.
func runLoad(fs *flag.FlagSet) error {
	target := fs.String("url", "", "the URL to GET")
	token := fs.String("token", "", "an API key (Authorization: Bearer)")
	etag := fs.Bool("etag", false, "send the first answer's ETag back as If-None-Match (expect 304)")
	c := fs.Int("c", 16, "concurrent requests")
	d := fs.Duration("d", 5*time.Second, "how long to measure")
	_ = fs.Parse(os.Args[2:])
	client := &http.Client{Transport: &http.Transport{MaxIdleConnsPerHost: *c, MaxConnsPerHost: *c},
		Timeout: 30 * time.Second}
	inm, want, err := prime(client, *target, *token, *etag)
	if err != nil {
		return err
	}
	send := func() bool { return get(client, *target, *token, inm) == want }
	run(send, *c, time.Second) // warm-up
	lat, failed := run(send, *c, *d)
	slices.Sort(lat)
	if len(lat) == 0 {
		return fmt.Errorf("no request succeeded (%d failed)", failed)
	}
	fmt.Printf("%.0f req/s  p50 %.2f ms  p99 %.2f ms  failed %d\n", float64(len(lat))/d.Seconds(),
		ms(lat[len(lat)/2]), ms(lat[len(lat)*99/100]), failed)
	return nil
}

func ms(d time.Duration) float64 { return float64(d) / float64(time.Millisecond) }

// prime makes one request: the ETag to send back and the status to
// expect.
func prime(client *http.Client, target, token string, etag bool) (string, int, error) {
	req, _ := http.NewRequest(http.MethodGet, target, nil)
	if token != "" {
		req.Header.Set("Authorization", "Bearer "+token)
	}
	resp, err := client.Do(req)
	if err != nil {
		return "", 0, err
	}
	_, _ = io.Copy(io.Discard, resp.Body)
	resp.Body.Close()
	if resp.StatusCode != http.StatusOK {
		return "", 0, fmt.Errorf("GET %s: %d", target, resp.StatusCode)
	}
	if etag {
		return resp.Header.Get("ETag"), http.StatusNotModified, nil
	}
	return "", http.StatusOK, nil
}

func get(client *http.Client, target, token, inm string) int {
	req, _ := http.NewRequest(http.MethodGet, target, nil)
	if token != "" {
		req.Header.Set("Authorization", "Bearer "+token)
	}
	if inm != "" {
		req.Header.Set("If-None-Match", inm)
	}
	resp, err := client.Do(req)
	if err != nil {
		return 0
	}
	_, _ = io.Copy(io.Discard, resp.Body)
	resp.Body.Close()
	return resp.StatusCode
}

// run calls send from c goroutines for d; it returns the latencies of the
// calls that succeeded and counts the others.
func run(send func() bool, c int, d time.Duration) ([]time.Duration, int) {
	var mu sync.Mutex
	var all []time.Duration
	failed := 0
	end := time.Now().Add(d)
	var wg sync.WaitGroup
	for range c {
		wg.Go(func() {
			var lat []time.Duration
			bad := 0
			for time.Now().Before(end) {
				t := time.Now()
				if send() {
					lat = append(lat, time.Since(t))
				} else {
					bad++
				}
			}
			mu.Lock()
			all, failed = append(all, lat...), failed+bad
			mu.Unlock()
		})
	}
	wg.Wait()
	return all, failed
}
