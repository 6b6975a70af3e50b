package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"flag"
	"io"
	"log"
	"net"
	"net/http"
	"net/http/httptest"
	"strings"
	"testing"
	"time"

	"github.com/google/go-cmp/cmp"

	"github.com/rolloff/rolloff/examples/internal/pipeline"
)

func newTestServer(t *testing.T) *httptest.Server {
	t.Helper()
	h := newHandler(config{maxBody: 4 << 10, maxTrials: 500, workers: 2}, log.New(io.Discard, "", 0))
	ts := httptest.NewServer(h)
	t.Cleanup(ts.Close)
	return ts
}

func post(t *testing.T, ts *httptest.Server, body, ctype string) (*http.Response, []byte) {
	t.Helper()
	req, err := http.NewRequest(http.MethodPost, ts.URL+"/design", strings.NewReader(body))
	if err != nil {
		t.Fatal(err)
	}
	if ctype != "" {
		req.Header.Set("Content-Type", ctype)
	}
	resp, err := ts.Client().Do(req)
	if err != nil {
		t.Fatal(err)
	}
	defer resp.Body.Close()
	b, err := io.ReadAll(resp.Body)
	if err != nil {
		t.Fatal(err)
	}
	return resp, b
}

const goodBody = `{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 2, "atten_db": 50}, "trials": 200}`

func TestDesignGood(t *testing.T) {
	ts := newTestServer(t)
	resp, b := post(t, ts, goodBody, "application/json")
	if resp.StatusCode != http.StatusOK {
		t.Fatalf("status %d: %s", resp.StatusCode, b)
	}
	if ct := resp.Header.Get("Content-Type"); !strings.HasPrefix(ct, "application/json") {
		t.Errorf("content type %q", ct)
	}
	doc, err := pipeline.UnmarshalDocument(b)
	if err != nil {
		t.Fatal(err)
	}
	// The served document is the pipeline's, byte for byte.
	req, _ := pipeline.DecodeRequestBytes([]byte(goodBody))
	r, err := pipeline.Run(req)
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(r.Doc, doc); diff != "" {
		t.Errorf("served document differs:\n%s", diff)
	}
	want, _ := pipeline.MarshalDocument(r.Doc)
	if !bytes.Equal(want, b) {
		t.Error("served bytes differ from MarshalDocument's")
	}
	// No content type at all is taken as JSON too.
	if resp, b := post(t, ts, goodBody, ""); resp.StatusCode != http.StatusOK {
		t.Errorf("no content type: %d %s", resp.StatusCode, b)
	}
}

func TestDesignErrors(t *testing.T) {
	ts := newTestServer(t)
	for _, c := range []struct {
		name, body, ctype string
		status            int
		field             string // "" for no field
		says              string
	}{
		{"bad JSON", `{"mask": {"band": "lowpass",`, "application/json", 400, "", "JSON"},
		{"wrong type", `{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 2, "atten_db": 50}, "trials": "many"}`, "application/json", 400, "trials", "wrong type"},
		{"unknown field", `{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 2, "atten_db": 50}, "seeds": 4}`, "application/json", 400, "seeds", "unknown field"},
		{"bad mask", `{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [400], "ripple_db": 2, "atten_db": 50}}`, "application/json", 400, "mask", "filter"},
		{"mask field missing", `{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 2}}`, "application/json", 400, "mask", "atten_db"},
		{"no mask", `{}`, "application/json", 400, "mask", "missing"},
		{"empty body", ``, "application/json", 400, "", "empty"},
		{"too many trials", `{"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 2, "atten_db": 50}, "trials": 5000}`, "application/json", 400, "trials", "at most 500"},
		{"too big", `{"name": "` + strings.Repeat("x", 5000) + `"}`, "application/json", 413, "", "over"},
		{"not JSON", goodBody, "text/plain", 415, "", "application/json"},
		{"unbuildable", `{"families": ["bessel"], "mask": {"band": "lowpass", "pass_hz": [100], "stop_hz": [110], "ripple_db": 1, "atten_db": 80}}`, "application/json", 422, "", "no buildable design"},
	} {
		t.Run(c.name, func(t *testing.T) {
			resp, b := post(t, ts, c.body, c.ctype)
			if resp.StatusCode != c.status {
				t.Fatalf("status %d, want %d: %s", resp.StatusCode, c.status, b)
			}
			var e apiError
			dec := json.NewDecoder(bytes.NewReader(b))
			dec.DisallowUnknownFields()
			if err := dec.Decode(&e); err != nil {
				t.Fatalf("error body %q is not the JSON error: %v", b, err)
			}
			if e.Field != c.field {
				t.Errorf("field %q, want %q (%s)", e.Field, c.field, e.Error)
			}
			if !strings.Contains(e.Error, c.says) {
				t.Errorf("error %q does not say %q", e.Error, c.says)
			}
		})
	}
}

func TestWrongMethodAndPath(t *testing.T) {
	ts := newTestServer(t)
	for _, c := range []struct {
		method, path string
		status       int
	}{
		{http.MethodGet, "/design", http.StatusMethodNotAllowed},
		{http.MethodPut, "/design", http.StatusMethodNotAllowed},
		{http.MethodDelete, "/demo", http.StatusMethodNotAllowed},
		{http.MethodGet, "/nowhere", http.StatusNotFound},
	} {
		req, _ := http.NewRequest(c.method, ts.URL+c.path, nil)
		resp, err := ts.Client().Do(req)
		if err != nil {
			t.Fatal(err)
		}
		b, _ := io.ReadAll(resp.Body)
		resp.Body.Close()
		if resp.StatusCode != c.status {
			t.Errorf("%s %s: status %d, want %d", c.method, c.path, resp.StatusCode, c.status)
		}
		var e apiError
		if err := json.Unmarshal(b, &e); err != nil || e.Error == "" {
			t.Errorf("%s %s: body %q not a JSON error", c.method, c.path, b)
		}
		if c.status == http.StatusMethodNotAllowed && !strings.Contains(resp.Header.Get("Allow"), "POST") && !strings.Contains(resp.Header.Get("Allow"), "GET") {
			t.Errorf("%s %s: Allow %q", c.method, c.path, resp.Header.Get("Allow"))
		}
	}
}

func TestDemoRoundTrip(t *testing.T) {
	// GET /demo gives a request that POST /design designs (fewer trials).
	ts := newTestServer(t)
	resp, err := ts.Client().Get(ts.URL + "/demo")
	if err != nil {
		t.Fatal(err)
	}
	b, _ := io.ReadAll(resp.Body)
	resp.Body.Close()
	req, err := pipeline.DecodeRequestBytes(b)
	if err != nil {
		t.Fatal(err)
	}
	req.Trials = 200
	body, _ := json.Marshal(req)
	if resp, out := post(t, ts, string(body), "application/json"); resp.StatusCode != http.StatusOK {
		t.Fatalf("demo request: %d %s", resp.StatusCode, out)
	}
	if resp, err := ts.Client().Get(ts.URL + "/healthz"); err != nil || resp.StatusCode != http.StatusOK {
		t.Errorf("healthz: %v %v", resp, err)
	}
}

// TestGracefulShutdown starts serve on a loopback port, cancels its
// context while a design is in flight, and checks that the request still
// completes and serve returns nil.
func TestGracefulShutdown(t *testing.T) {
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	h := newHandler(config{maxBody: 4 << 10, maxTrials: 5000, workers: 1}, log.New(io.Discard, "", 0))
	done := make(chan error, 1)
	go func() { done <- serve(ctx, ln, h) }()
	url := "http://" + ln.Addr().String() + "/design"
	got := make(chan int, 1)
	go func() {
		resp, err := http.Post(url, "application/json", strings.NewReader(strings.Replace(goodBody, `"trials": 200`, `"trials": 3000`, 1)))
		if err != nil {
			got <- -1
			return
		}
		resp.Body.Close()
		got <- resp.StatusCode
	}()
	time.Sleep(100 * time.Millisecond) // let the request reach the handler
	cancel()
	select {
	case code := <-got:
		if code != http.StatusOK {
			t.Errorf("in-flight request: status %d", code)
		}
	case <-time.After(20 * time.Second):
		t.Fatal("in-flight request did not finish")
	}
	select {
	case err := <-done:
		if err != nil {
			t.Errorf("serve: %v", err)
		}
	case <-time.After(20 * time.Second):
		t.Fatal("serve did not return after cancel")
	}
	if _, err := http.Post(url, "application/json", strings.NewReader(goodBody)); err == nil {
		t.Error("server still accepts connections after shutdown")
	}
}

func TestRunFlags(t *testing.T) {
	ctx := context.Background()
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"-addr", "256.0.0.1:99999"}, ""},
		{[]string{"-max-body", "0"}, "-max-body"},
		{[]string{"-max-trials", "0"}, "-max-trials"},
		{[]string{"-workers", "0"}, "-workers"},
		{[]string{"-bogus"}, "not defined"},
		{[]string{"extra"}, "unexpected argument"},
	} {
		var stdout, stderr bytes.Buffer
		err := run(ctx, c.args, &stdout, &stderr)
		if err == nil || !strings.Contains(err.Error()+stderr.String(), c.want) {
			t.Errorf("%v: error %v, want one saying %q", c.args, err, c.want)
		}
	}
	// run serves on the address given and stops with its context.
	cctx, cancel := context.WithCancel(ctx)
	var stdout, stderr bytes.Buffer
	done := make(chan error, 1)
	go func() { done <- run(cctx, []string{"-addr", "127.0.0.1:0"}, &stdout, &stderr) }()
	time.Sleep(50 * time.Millisecond)
	cancel()
	if err := <-done; err != nil {
		t.Errorf("run: %v", err)
	}
	var help bytes.Buffer
	if err := run(ctx, []string{"-h"}, &help, &help); !errors.Is(err, flag.ErrHelp) {
		t.Errorf("-h: %v", err)
	}
}

// TestConcurrentRequests sends more requests at once than the server has
// design slots: all succeed, with the same document for the same request.
func TestConcurrentRequests(t *testing.T) {
	ts := newTestServer(t) // 2 slots
	const n = 5
	bodies := make(chan []byte, n)
	for range n {
		go func() {
			resp, err := ts.Client().Post(ts.URL+"/design", "application/json", strings.NewReader(goodBody))
			if err != nil {
				bodies <- nil
				return
			}
			defer resp.Body.Close()
			b, _ := io.ReadAll(resp.Body)
			if resp.StatusCode != http.StatusOK {
				b = nil
			}
			bodies <- b
		}()
	}
	first := <-bodies
	if first == nil {
		t.Fatal("a request failed")
	}
	for range n - 1 {
		if b := <-bodies; !bytes.Equal(b, first) {
			t.Error("concurrent requests got different documents (or failed)")
		}
	}
}
