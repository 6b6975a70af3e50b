package topology

import (
	"bufio"
	"fmt"
	"io"
	"math"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/internal/mna"
)

// SPICEOpAmpGain is the voltage gain of the voltage-controlled voltage
// source that stands for each ideal op-amp in the decks WriteSPICE writes.
// With 1e7 the deck's response differs from the ideal (nullor) analysis of
// AtHz by about (1 + noise gain)/1e7 relative: below 1e-5 dB for these
// circuits.
const SPICEOpAmpGain = 1e7

// WriteSPICE writes the chain as a SPICE deck that ngspice runs as it is: a
// title line, the source "VIN in 0 AC 1", each circuit under a comment line
// naming its kind, stage kind, f0, Q (and zero and gain), each op-amp as a
// voltage-controlled voltage source of gain SPICEOpAmpGain from its inputs
// to its output, the chain's output at node "out", no analysis commands,
// and ".end". Node names read as s<stage>_<node> (s1_a, s2_n1, ...); the
// output of stage k is s<k>_out and the input of stage k+1; part names are
// the circuit's references with the stage appended (R1_s1, C2_s3, E1_s2 for
// U1 of stage 2). Values are written with 12 significant digits.
//
// Errors wrap ErrStage for an empty chain, the template errors of a circuit
// that fits no template, and any error of w.
func (c Chain) WriteSPICE(w io.Writer) error {
	return c.writeDeck(w, nil)
}

// WriteSPICEWith writes the deck of WriteSPICE with every op-amp as the
// single-pole macro model of op instead of a large-gain VCVS: a
// transconductance A0 (A/V, from the inputs) into 1 Ω parallel to
// A0/(2π·GBW) farads (the open-loop pole at GBW/A0), buffered by a
// unity-gain VCVS behind ROutOhm (omitted when 0). Its AC response is the
// model of AtHzWith(op, f). op must have a finite positive DCGain and
// GBWHz (SPICE needs a DC path at every node); errors wrap ErrOpAmp, and
// as WriteSPICE.
func (c Chain) WriteSPICEWith(w io.Writer, op OpAmp) error {
	if _, err := op.amp(); err != nil {
		return err
	}
	if !(op.DCGain > 0) || math.IsInf(op.DCGain, 0) || !(op.GBWHz > 0) || math.IsInf(op.GBWHz, 0) {
		return fmt.Errorf("topology: WriteSPICEWith: DCGain %g and GBWHz %g must be positive and finite: %w", op.DCGain, op.GBWHz, ErrOpAmp)
	}
	return c.writeDeck(w, &op)
}

func (c Chain) writeDeck(w io.Writer, op *OpAmp) error {
	if len(c.Circuits) == 0 {
		return fmt.Errorf("topology: WriteSPICE: empty chain: %w", ErrStage)
	}
	ds := make([]*design, len(c.Circuits))
	for i, ci := range c.Circuits {
		d, err := ci.design()
		if err != nil {
			return fmt.Errorf("topology: WriteSPICE: stage %d: %w", i+1, err)
		}
		if _, err := valuesOf(d, ci.Parts, new([maxParts]float64)); err != nil {
			return fmt.Errorf("topology: WriteSPICE: stage %d: %w", i+1, err)
		}
		ds[i] = d
	}
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "rolloff filter chain, %d stage(s)\n", len(c.Circuits))
	if op == nil {
		fmt.Fprintf(bw, "* ideal op-amps are VCVS of gain %.0e; the input is node in, the output node out\n", SPICEOpAmpGain)
	} else {
		fmt.Fprintf(bw, "* op-amps: DC gain %.6g, GBW %.6g Hz, output resistance %.6g ohm (one-pole macro model); the input is node in, the output node out\n",
			op.DCGain, op.GBWHz, op.ROutOhm)
	}
	fmt.Fprintf(bw, "VIN in 0 AC 1\n")
	last := len(c.Circuits) - 1
	for i, ci := range c.Circuits {
		d := ds[i]
		k := i + 1
		node := func(n int) string {
			if n == 0 {
				return "0"
			}
			name := d.nodes[n-1]
			switch {
			case name == "in" && i == 0:
				return "in"
			case name == "in":
				return fmt.Sprintf("s%d_out", i)
			case name == "out" && i == last:
				return "out"
			}
			return fmt.Sprintf("s%d_%s", k, name)
		}
		fmt.Fprintf(bw, "* stage %d: %s\n", k, describe(ci, d))
		amp := 0
		for _, e := range d.net.Elements {
			switch e.Kind {
			case mna.Resistor, mna.Capacitor:
				fmt.Fprintf(bw, "%s_s%d %s %s %.12g\n", d.refs[e.Value], k, node(e.A), node(e.B), ci.Parts[e.Value].Value)
			case mna.OpAmp:
				amp++
				if op == nil {
					fmt.Fprintf(bw, "E%d_s%d %s 0 %s %s %.0e\n", amp, k, node(e.Out), node(e.A), node(e.B), SPICEOpAmpGain)
					continue
				}
				x := fmt.Sprintf("s%d_u%dx", k, amp)
				y := node(e.Out)
				if op.ROutOhm > 0 {
					y = fmt.Sprintf("s%d_u%dy", k, amp)
				}
				fmt.Fprintf(bw, "G%d_s%d 0 %s %s %s %.12g\n", amp, k, x, node(e.A), node(e.B), op.DCGain)
				fmt.Fprintf(bw, "RP%d_s%d %s 0 1\n", amp, k, x)
				fmt.Fprintf(bw, "CP%d_s%d %s 0 %.12g\n", amp, k, x, op.DCGain/(2*math.Pi*op.GBWHz))
				fmt.Fprintf(bw, "E%d_s%d %s 0 %s 0 1\n", amp, k, y, x)
				if op.ROutOhm > 0 {
					fmt.Fprintf(bw, "RO%d_s%d %s %s %.12g\n", amp, k, y, node(e.Out), op.ROutOhm)
				}
			}
		}
	}
	fmt.Fprintf(bw, ".end\n")
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("topology: WriteSPICE: %w", err)
	}
	return nil
}

// describe is the comment line of one stage.
func describe(c Circuit, d *design) string {
	st := c.Stage
	s := fmt.Sprintf("%v %v, order %d, f0 = %.6g Hz", c.Kind, st.Kind, st.Order, st.F0Hz)
	if st.Order == 2 {
		s += fmt.Sprintf(", Q = %.6g", st.Q)
	}
	if st.Kind == filter.NotchStage {
		s += fmt.Sprintf(", zero = %.6g Hz", st.ZeroHz)
	}
	s += fmt.Sprintf(", gain = %.6g", st.Gain)
	if d.inverting {
		s += ", inverting"
	}
	if d.note != "" {
		s += " (" + d.note + ")"
	}
	return s
}
