// Command server is the core of a design front end: a small HTTP server on
// localhost that takes a JSON mask and returns the JSON design document.
//
//	POST /design   body: a pipeline.Request ({"mask": {...}, ...});
//	               200: the pipeline.Document ("version": "rolloff.design/v1")
//	               400: bad JSON or a bad field, {"error": ..., "field": ...}
//	               413: body larger than -max-body; 415: a Content-Type
//	               other than application/json (none is taken as JSON);
//	               422: a valid mask no family can build
//	GET  /demo     the built-in demo request, to POST back
//	GET  /healthz  "ok"
//
// The built-in demo request is the microphone band filter of the Wren-2,
// an invented bird-call recorder left in hedges: calls between 1.5 and
// 9 kHz, wind rumble below 300 Hz and the ultrasound of its own switching
// regulator above 40 kHz kept 35 dB down.
//
// It serves until interrupted (SIGINT or SIGTERM), then stops taking
// connections and lets requests in flight finish (up to 10 s). Designs run
// at most -workers at a time; requests beyond wait for a slot until the
// client gives up.
//
// Usage:
//
//	go run ./examples/server                      # http://127.0.0.1:8080
//	curl -s localhost:8080/demo |
//	    curl -s -H 'Content-Type: application/json' -d @- localhost:8080/design
//
// Caution: verify designs by simulation and on the bench; mains-powered or
// medical equipment needs qualified review under local codes.
package main

import (
	"bytes"
	"context"
	_ "embed"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"log"
	"mime"
	"net"
	"net/http"
	"os"
	"os/signal"
	"runtime"
	"syscall"
	"time"

	"github.com/rolloff/rolloff/examples/internal/pipeline"
)

//go:embed demo.json
var demo []byte

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	if err := run(ctx, os.Args[1:], os.Stdout, os.Stderr); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return // -h: the usage was printed
		}
		fmt.Fprintln(os.Stderr, "server:", err)
		os.Exit(1)
	}
}

// config are the server's limits.
type config struct {
	maxBody   int64 // bytes of a request body
	maxTrials int   // Monte Carlo trials a request may ask for
	workers   int   // designs at once
}

func run(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("server", flag.ContinueOnError)
	fs.SetOutput(stderr)
	addr := fs.String("addr", "127.0.0.1:8080", "address to listen on (host:port)")
	maxBody := fs.Int64("max-body", 64<<10, "largest request body, bytes")
	maxTrials := fs.Int("max-trials", 20000, "most Monte Carlo trials a request may ask for")
	workers := fs.Int("workers", runtime.GOMAXPROCS(0), "designs computed at once")
	fs.Usage = func() {
		fmt.Fprintln(stderr, "usage: server [-addr host:port] [-max-body bytes] [-max-trials n] [-workers n]")
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		return err
	}
	if fs.NArg() > 0 {
		return fmt.Errorf("unexpected argument %q", fs.Arg(0))
	}
	switch {
	case *maxBody < 1:
		return fmt.Errorf("-max-body %d: want at least 1 byte", *maxBody)
	case *maxTrials < 1 || *maxTrials > pipeline.MaxTrials:
		return fmt.Errorf("-max-trials %d: want 1 to %d", *maxTrials, pipeline.MaxTrials)
	case *workers < 1:
		return fmt.Errorf("-workers %d: want at least 1", *workers)
	}
	ln, err := net.Listen("tcp", *addr)
	if err != nil {
		return err
	}
	fmt.Fprintf(stdout, "rolloff design server on http://%s (POST /design, GET /demo); interrupt to stop\n", ln.Addr())
	h := newHandler(config{maxBody: *maxBody, maxTrials: *maxTrials, workers: *workers}, log.New(stderr, "server: ", 0))
	return serve(ctx, ln, h)
}

// serve serves h on ln until ctx is done, then shuts down gracefully.
func serve(ctx context.Context, ln net.Listener, h http.Handler) error {
	srv := &http.Server{
		Handler:           h,
		ReadHeaderTimeout: 5 * time.Second,
		ReadTimeout:       30 * time.Second,
		WriteTimeout:      2 * time.Minute,
		IdleTimeout:       time.Minute,
	}
	done := make(chan error, 1)
	go func() { done <- srv.Serve(ln) }()
	select {
	case err := <-done:
		return err
	case <-ctx.Done():
	}
	sctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
	defer cancel()
	if err := srv.Shutdown(sctx); err != nil {
		return fmt.Errorf("shutdown: %w", err)
	}
	if err := <-done; !errors.Is(err, http.ErrServerClosed) {
		return err
	}
	return nil
}

// apiError is the body of every error response.
type apiError struct {
	// Error says what is wrong.
	Error string `json:"error"`
	// Field is the JSON path of the offending request field, when one is
	// to blame ("mask", "families[1]").
	Field string `json:"field,omitempty"`
}

func writeJSON(w http.ResponseWriter, status int, body []byte) {
	w.Header().Set("Content-Type", "application/json; charset=utf-8")
	w.Header().Set("X-Content-Type-Options", "nosniff")
	w.WriteHeader(status)
	w.Write(body)
}

func writeError(w http.ResponseWriter, status int, err error) {
	e := apiError{Error: err.Error()}
	var fe *pipeline.FieldError
	if errors.As(err, &fe) {
		e.Field = fe.Field
	}
	b, _ := json.Marshal(e) // a struct of two strings always marshals
	writeJSON(w, status, append(b, '\n'))
}

// newHandler returns the server's routes.
func newHandler(cfg config, logger *log.Logger) http.Handler {
	slots := make(chan struct{}, cfg.workers)
	mux := http.NewServeMux()
	mux.HandleFunc("POST /design", func(w http.ResponseWriter, r *http.Request) {
		if ct := r.Header.Get("Content-Type"); ct != "" {
			if mt, _, err := mime.ParseMediaType(ct); err != nil || mt != "application/json" {
				writeError(w, http.StatusUnsupportedMediaType, fmt.Errorf("content type %q: send application/json", ct))
				return
			}
		}
		body, err := io.ReadAll(http.MaxBytesReader(w, r.Body, cfg.maxBody))
		if err != nil {
			var tooBig *http.MaxBytesError
			if errors.As(err, &tooBig) {
				writeError(w, http.StatusRequestEntityTooLarge, fmt.Errorf("request body over %d bytes", tooBig.Limit))
				return
			}
			writeError(w, http.StatusBadRequest, fmt.Errorf("reading the body: %w", err))
			return
		}
		req, err := pipeline.DecodeRequest(bytes.NewReader(body))
		if err != nil {
			writeError(w, http.StatusBadRequest, err)
			return
		}
		if req.Trials > cfg.maxTrials {
			writeError(w, http.StatusBadRequest, &pipeline.FieldError{Field: "trials",
				Err: fmt.Errorf("%d trials: this server allows at most %d: %w", req.Trials, cfg.maxTrials, pipeline.ErrRequest)})
			return
		}
		select {
		case slots <- struct{}{}:
		case <-r.Context().Done():
			return // the client gave up while waiting
		}
		res, err := pipeline.RunContext(r.Context(), req)
		<-slots
		switch {
		case r.Context().Err() != nil:
			return // the client gave up: nothing to send, the run stopped early
		case errors.Is(err, pipeline.ErrRequest):
			writeError(w, http.StatusBadRequest, err)
			return
		case errors.Is(err, pipeline.ErrDesign):
			writeError(w, http.StatusUnprocessableEntity, err)
			return
		case err != nil:
			logger.Printf("design: %v", err)
			writeError(w, http.StatusInternalServerError, errors.New("internal error while designing"))
			return
		}
		doc, err := pipeline.MarshalDocument(res.Doc)
		if err != nil {
			logger.Printf("document: %v", err)
			writeError(w, http.StatusInternalServerError, errors.New("internal error while encoding the document"))
			return
		}
		writeJSON(w, http.StatusOK, doc)
	})
	mux.HandleFunc("GET /demo", func(w http.ResponseWriter, r *http.Request) {
		writeJSON(w, http.StatusOK, demo)
	})
	mux.HandleFunc("GET /healthz", func(w http.ResponseWriter, r *http.Request) {
		w.Header().Set("Content-Type", "text/plain; charset=utf-8")
		io.WriteString(w, "ok\n")
	})
	// Everything else: a JSON 404 or 405 instead of the mux's plain text.
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		_, pattern := mux.Handler(r)
		if pattern != "" {
			mux.ServeHTTP(w, r)
			return
		}
		rec := &statusProbe{}
		mux.ServeHTTP(rec, r)
		if rec.status == http.StatusMethodNotAllowed {
			w.Header().Set("Allow", rec.header.Get("Allow"))
			writeError(w, http.StatusMethodNotAllowed, fmt.Errorf("method %s not allowed on %s (allowed: %s)", r.Method, r.URL.Path, rec.header.Get("Allow")))
			return
		}
		writeError(w, http.StatusNotFound, fmt.Errorf("no such path %s (POST /design, GET /demo, GET /healthz)", r.URL.Path))
	})
}

// statusProbe records the status and headers the mux would send, without
// sending anything.
type statusProbe struct {
	header http.Header
	status int
}

func (p *statusProbe) Header() http.Header {
	if p.header == nil {
		p.header = http.Header{}
	}
	return p.header
}
func (p *statusProbe) Write(b []byte) (int, error) { return len(b), nil }
func (p *statusProbe) WriteHeader(s int)           { p.status = s }
