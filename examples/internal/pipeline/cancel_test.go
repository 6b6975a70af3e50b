package pipeline

import (
	"context"
	"errors"
	"testing"
	"time"
)

// TestRunContext checks that a done context stops a run with an error
// matching the context's, before the start and within a long Monte Carlo
// run, and that a live one gives Run's document.
func TestRunContext(t *testing.T) {
	req, err := DecodeRequestBytes([]byte(testRequest))
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := RunContext(ctx, req); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled context: error %v", err)
	}
	long := req
	long.Trials = MaxTrials // several seconds for all five families
	ctx, cancel = context.WithTimeout(context.Background(), 50*time.Millisecond)
	defer cancel()
	start := time.Now()
	_, err = RunContext(ctx, long)
	if !errors.Is(err, context.DeadlineExceeded) {
		t.Fatalf("expired context: error %v", err)
	}
	if took := time.Since(start); took > 2*time.Second {
		t.Errorf("the stopped run took %v", took)
	}
	a, err := Run(req)
	if err != nil {
		t.Fatal(err)
	}
	b, err := RunContext(context.Background(), req)
	if err != nil {
		t.Fatal(err)
	}
	ja, _ := MarshalDocument(a.Doc)
	jb, _ := MarshalDocument(b.Doc)
	if string(ja) != string(jb) {
		t.Error("RunContext's document differs from Run's")
	}
}
