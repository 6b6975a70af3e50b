package main

import (
	"cmp"
	"fmt"
	"io"
	"math"
	"slices"
	"sync"

	"github.com/rolloff/rolloff/examples/internal/pipeline"
	"github.com/rolloff/rolloff/examples/internal/textable"
	"github.com/rolloff/rolloff/series"
)

// job is one combination to design.
type job struct {
	family, kind, parts string
	req                 pipeline.Request
}

// row is a job's outcome.
type row struct {
	job
	index int // position in the job list: the last tie-break
	cand  pipeline.Candidate
	err   error
}

// sweep designs every job on a pool of at most workers goroutines and
// returns the rows in job order (each worker writes only its own rows'
// slots, so the result does not depend on scheduling).
func sweep(jobs []job, workers int) []row {
	rows := make([]row, len(jobs))
	next := make(chan int)
	var wg sync.WaitGroup
	for range min(workers, len(jobs)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				r := row{job: jobs[i], index: i}
				res, err := pipeline.Evaluate(jobs[i].req, jobs[i].family)
				if err != nil {
					r.err = err
				} else {
					r.cand = res.Doc.Candidates[0]
				}
				rows[i] = r
			}
		}()
	}
	for i := range jobs {
		next <- i
	}
	close(next)
	wg.Wait()
	return rows
}

// rank sorts rows best first by the rule in the package comment.
func rank(rows []row) {
	yield := func(r row) float64 { return math.Round(10*r.cand.YieldPct) / 10 }
	slices.SortStableFunc(rows, func(a, b row) int {
		if x := cmp.Compare(boolInt(a.err != nil), boolInt(b.err != nil)); x != 0 {
			return x
		}
		if a.err != nil { // both failed: input order
			return cmp.Compare(a.index, b.index)
		}
		if x := cmp.Compare(yield(b), yield(a)); x != 0 {
			return x
		}
		for _, x := range []int{
			cmp.Compare(a.cand.OpAmps, b.cand.OpAmps),
			cmp.Compare(a.cand.Parts, b.cand.Parts),
			cmp.Compare(a.cand.DeviationDB, b.cand.DeviationDB),
			cmp.Compare(a.cand.MaxGBWHz, b.cand.MaxGBWHz),
		} {
			if x != 0 {
				return x
			}
		}
		return cmp.Compare(a.index, b.index)
	})
}

func boolInt(b bool) int {
	if b {
		return 1
	}
	return 0
}

func printTable(w io.Writer, base pipeline.Request, rows []row) error {
	rank(rows)
	name := base.Name
	if name == "" {
		name = "design sweep"
	}
	fmt.Fprintf(w, "Rolloff sweep: %s\n", name)
	fmt.Fprintf(w, "Mask: %s\n%d combinations, %d Monte Carlo trials each (seed %d)\n",
		pipeline.MaskText(base.Mask), len(rows), base.Trials, base.Seed)
	fmt.Fprintln(w, "Best first: higher yield, then fewer op-amps, fewer parts, less deviation, lower GBW.")
	fmt.Fprintln(w)
	t := &textable.Table{Right: []bool{true, false, false, false, true, true, true, true, true, true, true}}
	t.Row("#", "family", "circuit", "parts R/C", "order", "op-amps", "parts", "worst dev dB", "yield %", "max GBW", "noise µV")
	var failed []row
	for i, r := range rows {
		if r.err != nil {
			failed = append(failed, r)
			continue
		}
		c := r.cand
		t.Row(fmt.Sprint(i+1), r.family, r.kind, r.parts, fmt.Sprint(c.Order), fmt.Sprint(c.OpAmps), fmt.Sprint(c.Parts),
			fmt.Sprintf("%.3f", c.DeviationDB), fmt.Sprintf("%.1f", c.YieldPct), series.Format{Digits: 3}.Value(c.MaxGBWHz, "Hz"),
			fmt.Sprintf("%.3g", c.NoiseUV))
	}
	if _, err := t.WriteTo(w); err != nil {
		return err
	}
	if len(failed) > 0 {
		fmt.Fprintf(w, "\nNot buildable (%d combinations):\n", len(failed))
		// Rows that fail for the same family, circuit and reason are one
		// line, their part policies listed together.
		f := &textable.Table{Indent: "  "}
		for i := 0; i < len(failed); {
			j := i + 1
			pols := failed[i].parts
			for j < len(failed) && failed[j].family == failed[i].family && failed[j].kind == failed[i].kind &&
				failed[j].err.Error() == failed[i].err.Error() {
				pols += " " + failed[j].parts
				j++
			}
			f.Row(failed[i].family, failed[i].kind, pols, failed[i].err.Error())
			i = j
		}
		if _, err := f.WriteTo(w); err != nil {
			return err
		}
	}
	return nil
}
