package robust_test

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"hash/fnv"
	"os"
	"os/exec"
	"slices"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/series"
)

// TestDeterministicRepeats runs every design path (Design, MinOrder,
// Stages, Realize, Snap, CheckMask, Sweep, Monte Carlo, worst case) three
// times and requires the same bits each time: no map iteration order, no
// clock, no shared random state leaks into a result.
func TestDeterministicRepeats(t *testing.T) {
	for _, j := range jobs {
		first := j.run(t, 50, 2)
		for r := range 2 {
			if got := j.run(t, 50, 2); !slices.Equal(got, first) {
				t.Errorf("%s: run %d differs from the first", j.name, r+2)
			}
		}
	}
}

// TestMonteCarloWorkerCounts runs seeded Monte Carlo analyses with 1, 2
// and 7 workers (7 does not divide the trial count, so the trials split
// unevenly) for both distributions, with mask and deviation criteria,
// percentiles and moments: every figure is bit-identical across worker
// counts, and a different seed gives different draws.
func TestMonteCarloWorkerCounts(t *testing.T) {
	trials := 1000
	if testing.Short() {
		trials = 150
	}
	for _, j := range jobs {
		h, err := filter.Design(j.fam, j.spec)
		if err != nil {
			t.Fatal(err)
		}
		st, _ := h.Stages()
		ch, err := realizeAll(st)
		if err != nil {
			t.Fatal(err)
		}
		pb, _ := series.PassbandOf(j.spec)
		sn, err := series.Snap(ch, series.Policy{Passband: pb, Resistors: series.E24, Capacitors: series.E6})
		if err != nil {
			t.Fatal(err)
		}
		spec := j.spec
		hz := []float64{j.spec.PassHz[0] / 3, j.spec.PassHz[0], j.spec.StopHz[0], j.spec.StopHz[1] + j.spec.StopHz[0]}
		for _, dist := range []series.Distribution{series.Uniform, series.Normal} {
			var ref series.Spread
			for i, w := range []int{1, 2, 7} {
				a := series.Analysis{Trials: trials, Seed: 12345, Workers: w, Dist: dist, Hz: hz, Spec: &spec,
					Band: &series.Deviation{LoHz: pb[0].LoHz, HiHz: pb[0].HiHz, DB: 0.5}, Percentiles: []float64{0.5, 50, 99.5}, Moments: true}
				sp, err := a.MonteCarlo(sn.Chain)
				if err != nil {
					t.Fatalf("%s %v workers %d: %v", j.name, dist, w, err)
				}
				if i == 0 {
					ref = sp
					continue
				}
				var rb, gb bits
				rb.spread(ref)
				gb.spread(sp)
				if !slices.Equal(rb, gb) {
					t.Errorf("%s %v: %d workers differ from 1 (yield %v vs %v)", j.name, dist, w, sp.Yield, ref.Yield)
				}
			}
			a := series.Analysis{Trials: trials, Seed: 54321, Workers: 2, Dist: dist, Hz: hz, Moments: true}
			other, err := a.MonteCarlo(sn.Chain)
			if err != nil {
				t.Fatal(err)
			}
			if slices.Equal(other.MeanDB, ref.MeanDB) {
				t.Errorf("%s %v: seeds 12345 and 54321 give the same mean gains", j.name, dist)
			}
		}
	}
}

// fingerprint runs every design path with the Monte Carlo workers left at
// their default (Workers 0: runtime.GOMAXPROCS) and returns a digest of
// every number produced.
func fingerprint(t testing.TB) string {
	var all bits
	for _, j := range jobs {
		all = append(all, j.run(t, 100, 0)...)
	}
	h := fnv.New64a()
	for _, x := range all {
		var b [8]byte
		binary.LittleEndian.PutUint64(b[:], x)
		h.Write(b[:])
	}
	return fmt.Sprintf("%d numbers, digest %016x", len(all), h.Sum64())
}

// TestFingerprintChild prints the fingerprint for TestDeterministicAcrossProcesses;
// it does nothing unless that test starts it.
func TestFingerprintChild(t *testing.T) {
	if os.Getenv("ROBUST_FINGERPRINT_CHILD") == "" {
		t.Skip("run by TestDeterministicAcrossProcesses")
	}
	fmt.Printf("FINGERPRINT %s\n", fingerprint(t))
}

// TestDeterministicAcrossProcesses runs the design paths in fresh
// processes with GOMAXPROCS 1, 2 and 5 (new address-space layout, new map
// seeds, a different default Monte Carlo worker count each time) and
// requires the same bits as this process.
func TestDeterministicAcrossProcesses(t *testing.T) {
	if testing.Short() {
		t.Skip("starts three test processes")
	}
	want := fingerprint(t)
	for _, procs := range []string{"1", "2", "5"} {
		cmd := exec.Command(os.Args[0], "-test.run=^TestFingerprintChild$", "-test.count=1")
		cmd.Env = append(os.Environ(), "ROBUST_FINGERPRINT_CHILD=1", "GOMAXPROCS="+procs)
		out, err := cmd.CombinedOutput()
		if err != nil {
			t.Fatalf("GOMAXPROCS=%s: %v\n%s", procs, err, out)
		}
		i := bytes.Index(out, []byte("FINGERPRINT "))
		if i < 0 {
			t.Fatalf("GOMAXPROCS=%s: no fingerprint in\n%s", procs, out)
		}
		got := string(bytes.TrimSpace(bytes.SplitN(out[i+len("FINGERPRINT "):], []byte("\n"), 2)[0]))
		if got != want {
			t.Errorf("GOMAXPROCS=%s: %s, this process %s", procs, got, want)
		}
	}
	t.Logf("every process: %s", want)
}
