package pipeline_test

import (
	"fmt"
	"log"

	"github.com/rolloff/rolloff/examples/internal/pipeline"
)

// Example runs the whole pipeline on a request document and reads the
// result document's headline figures.
func Example() {
	req, err := pipeline.DecodeRequestBytes([]byte(`{
		"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 2, "atten_db": 50},
		"families": ["butterworth", "chebyshev"],
		"capacitor_tol_pct": 2,
		"trials": 500
	}`))
	if err != nil {
		log.Fatal(err)
	}
	r, err := pipeline.Run(req)
	if err != nil {
		log.Fatal(err)
	}
	d := r.Doc
	fmt.Println(d.Version)
	for _, c := range d.Candidates {
		fmt.Printf("%s: order %d, %d op-amps, yield above 80 %%: %t\n", c.Family, c.Order, c.OpAmps, c.YieldPct > 80)
	}
	fmt.Printf("chosen %s with %d stages; deviation after snapping under 0.1 dB: %t\n",
		d.Family, len(d.Stages), d.DeviationDB < 0.1)
	// Output:
	// rolloff.design/v1
	// butterworth: order 5, 3 op-amps, yield above 80 %: true
	// chebyshev: order 4, 2 op-amps, yield above 80 %: true
	// chosen chebyshev with 2 stages; deviation after snapping under 0.1 dB: true
}
