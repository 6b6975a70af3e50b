package mna

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
)

// MaxDim is the largest MNA system a Workspace holds: non-ground nodes plus
// one for the source plus one per op-amp.
const MaxDim = 20

// Sentinel errors.
var (
	// ErrNetlist reports a malformed netlist: a node out of range, a
	// value index out of range, an op-amp driving ground, a system larger
	// than MaxDim.
	ErrNetlist = errors.New("mna: bad netlist")
	// ErrValue reports a part value that is not positive and finite.
	ErrValue = errors.New("mna: bad part value")
	// ErrSingular reports a circuit matrix that is singular at the
	// frequency asked (s at a pole, or a circuit with a floating node).
	ErrSingular = errors.New("mna: singular circuit matrix")
)

// ElementKind is the kind of a netlist element.
type ElementKind uint8

// The element kinds.
const (
	Resistor  ElementKind = iota + 1 // between A and B; value in ohms
	Capacitor                        // between A and B; value in farads
	OpAmp                            // non-inverting input A, inverting input B, output Out
)

// Element is one element of a Netlist. Nodes are numbered from 1; 0 is
// ground. Value is the index of the element's value in the values slice
// given to Transfer (resistors and capacitors only).
type Element struct {
	Kind  ElementKind
	A, B  int
	Out   int
	Value int
}

// Netlist is a linear circuit driven by a unit voltage source from ground to
// node In; Transfer returns V(Out)/V(In).
type Netlist struct {
	Nodes    int // non-ground nodes, numbered 1..Nodes
	In, Out  int
	Elements []Element
}

// Dim returns the size of the MNA system: nodes, source current, op-amp
// output currents.
func (n *Netlist) Dim() int {
	d := n.Nodes + 1
	for _, e := range n.Elements {
		if e.Kind == OpAmp {
			d++
		}
	}
	return d
}

// Count returns the number of capacitors and of op-amps.
func (n *Netlist) Count() (caps, opamps int) {
	for _, e := range n.Elements {
		switch e.Kind {
		case Capacitor:
			caps++
		case OpAmp:
			opamps++
		}
	}
	return caps, opamps
}

// Check reports whether n is well formed for a values slice of length
// nvalues. Workspace methods assume a checked netlist.
func (n *Netlist) Check(nvalues int) error {
	node := func(what string, i, k int) error {
		if k < 0 || k > n.Nodes {
			return fmt.Errorf("mna: element %d: %s node %d outside 0..%d: %w", i, what, k, n.Nodes, ErrNetlist)
		}
		return nil
	}
	if n.Nodes < 1 {
		return fmt.Errorf("mna: %d nodes: %w", n.Nodes, ErrNetlist)
	}
	if n.In < 1 || n.In > n.Nodes || n.Out < 1 || n.Out > n.Nodes {
		return fmt.Errorf("mna: input %d or output %d outside 1..%d: %w", n.In, n.Out, n.Nodes, ErrNetlist)
	}
	if d := n.Dim(); d > MaxDim {
		return fmt.Errorf("mna: system of size %d exceeds MaxDim %d: %w", d, MaxDim, ErrNetlist)
	}
	for i, e := range n.Elements {
		if err := node("A", i, e.A); err != nil {
			return err
		}
		if err := node("B", i, e.B); err != nil {
			return err
		}
		switch e.Kind {
		case Resistor, Capacitor:
			if e.Value < 0 || e.Value >= nvalues {
				return fmt.Errorf("mna: element %d: value index %d outside 0..%d: %w", i, e.Value, nvalues-1, ErrNetlist)
			}
		case OpAmp:
			if e.Out < 1 || e.Out > n.Nodes {
				return fmt.Errorf("mna: element %d: op-amp output node %d outside 1..%d: %w", i, e.Out, n.Nodes, ErrNetlist)
			}
		default:
			return fmt.Errorf("mna: element %d: kind %d unknown: %w", i, e.Kind, ErrNetlist)
		}
	}
	return nil
}

// Amp is the op-amp model used for every op-amp of a netlist. The zero
// value is the ideal op-amp (a nullor). DCGain zero or +Inf means infinite
// DC gain; GBWHz zero or +Inf means infinite gain-bandwidth; ROutOhm is the
// open-loop output resistance (0: none). With both DCGain and GBWHz
// infinite the output resistance has no effect.
type Amp struct {
	DCGain  float64 // open-loop DC gain A0 (V/V)
	GBWHz   float64 // gain-bandwidth product, hertz
	ROutOhm float64 // open-loop output resistance, ohms
}

// Ideal reports whether a is the ideal op-amp.
func (a Amp) Ideal() bool { return a.invDC() == 0 && a.invWt() == 0 }

// Check reports whether a's fields are non-negative and not NaN.
func (a Amp) Check() error {
	for _, v := range [...]float64{a.DCGain, a.GBWHz, a.ROutOhm} {
		if !(v >= 0) {
			return fmt.Errorf("mna: op-amp parameter %g negative or NaN: %w", v, ErrValue)
		}
	}
	if math.IsInf(a.ROutOhm, 0) {
		return fmt.Errorf("mna: op-amp output resistance infinite: %w", ErrValue)
	}
	return nil
}

func (a Amp) invDC() float64 {
	if a.DCGain == 0 || math.IsInf(a.DCGain, 1) {
		return 0
	}
	return 1 / a.DCGain
}

func (a Amp) invWt() float64 {
	if a.GBWHz == 0 || math.IsInf(a.GBWHz, 1) {
		return 0
	}
	return 1 / (2 * math.Pi * a.GBWHz)
}

// Degree returns an upper bound of the degree of the numerator and
// denominator polynomials of n's transfer with op-amp model a: the number
// of capacitors plus, for a band-limited op-amp, the number of op-amps.
func (n *Netlist) Degree(a Amp) int {
	caps, ops := n.Count()
	if a.invWt() != 0 {
		return caps + ops
	}
	return caps
}

// Workspace is the preallocated storage of one MNA solve. The zero value is
// ready to use. A Workspace is not safe for concurrent use: give each
// goroutine its own (it is a plain value of about 10 KB; a local variable
// stays on the stack, and reusing one saves clearing it per call).
type Workspace struct {
	m   [MaxDim * MaxDim]complex128
	b   [MaxDim]complex128
	inv [MaxDim]complex128 // reciprocal pivots
}

// Interpolator is a Workspace plus the buffers of Coefficients, kept so
// that a reused Interpolator neither clears them nor recomputes its sample
// points on every call. The zero value is ready to use; like a Workspace
// it is not safe for concurrent use.
type Interpolator struct {
	Workspace
	pn, pd, zs [MaxDim + 1]complex128
	zsM        int // number of sample points zs holds (0: none yet)
	v          [(MaxDim + 1) * (MaxDim + 1)]float64
	rn, rd     [MaxDim + 1]float64
}

// Transfer returns H(s) = V(Out)/V(In) of n with part values values and
// op-amp model a, and det, the determinant of the MNA matrix at s (so that
// H·det is the Cramer numerator). It does not allocate. n must have passed
// Check for len(values); values must be positive (Transfer does not check,
// for speed: use CheckValues once). The error is ErrSingular when the
// matrix is singular at s.
func (w *Workspace) Transfer(n *Netlist, values []float64, a Amp, s complex128) (h, det complex128, err error) {
	d := w.stamp(n, values, a, s)
	return w.solveRec(d, n.Out-1, nil)
}

// CheckValues reports whether every value is positive and finite.
func CheckValues(values []float64) error {
	for i, v := range values {
		if !(v > 0) || math.IsInf(v, 0) {
			return fmt.Errorf("mna: value %d is %g (must be positive and finite): %w", i, v, ErrValue)
		}
	}
	return nil
}

// stamp fills the d×d matrix and the right-hand side and returns d.
func (w *Workspace) stamp(n *Netlist, values []float64, a Amp, s complex128) int {
	d := n.Dim()
	m := w.m[:d*d]
	clear(m)
	clear(w.b[:d])
	add := func(i, j int, v complex128) { // i, j: node numbers (0: ground)
		if i > 0 && j > 0 {
			m[(i-1)*d+(j-1)] += v
		}
	}
	src := n.Nodes // source current unknown
	m[(n.In-1)*d+src] += 1
	m[src*d+(n.In-1)] += 1
	w.b[src] = 1
	invA := complex(a.invDC(), 0) + s*complex(a.invWt(), 0)
	k := src + 1
	for _, e := range n.Elements {
		switch e.Kind {
		case Resistor, Capacitor:
			var y complex128
			if e.Kind == Resistor {
				y = complex(1/values[e.Value], 0)
			} else {
				y = s * complex(values[e.Value], 0)
			}
			add(e.A, e.A, y)
			add(e.B, e.B, y)
			add(e.A, e.B, -y)
			add(e.B, e.A, -y)
		case OpAmp:
			// KCL at the output: the op-amp injects its output current.
			m[(e.Out-1)*d+k] -= 1
			// (V+ − V−) − (1/A)·(Vout + Rout·Iout) = 0.
			if e.A > 0 {
				m[k*d+e.A-1] += 1
			}
			if e.B > 0 {
				m[k*d+e.B-1] -= 1
			}
			m[k*d+e.Out-1] -= invA
			m[k*d+k] -= invA * complex(a.ROutOhm, 0)
			k++
		}
	}
	return d
}

// solveRec runs Gaussian elimination with partial pivoting on the d×d
// system and returns unknown out and the determinant. When piv is not nil
// it records the pivot row chosen in each column (in the row order of that
// step), for FixedInterpolator.
func (w *Workspace) solveRec(d, out int, piv *[MaxDim]int) (x, det complex128, err error) {
	m := w.m[:d*d]
	b := w.b[:d]
	det = 1
	for c := range d {
		p, best := c, -1.0
		for r := c; r < d; r++ {
			v := m[r*d+c]
			if a := math.Abs(real(v)) + math.Abs(imag(v)); a > best {
				p, best = r, a
			}
		}
		if !(best > 0) || math.IsInf(best, 0) {
			return 0, 0, ErrSingular
		}
		if piv != nil {
			piv[c] = p
		}
		if p != c {
			for j := c; j < d; j++ {
				m[p*d+j], m[c*d+j] = m[c*d+j], m[p*d+j]
			}
			b[p], b[c] = b[c], b[p]
			det = -det
		}
		piv := m[c*d+c]
		det *= piv
		inv := recip(piv)
		w.inv[c] = inv
		for r := c + 1; r < d; r++ {
			f := m[r*d+c] * inv
			if f == 0 {
				continue
			}
			row := m[r*d : r*d+d]
			prow := m[c*d : c*d+d]
			for j := c + 1; j < d; j++ {
				row[j] -= f * prow[j]
			}
			b[r] -= f * b[c]
		}
	}
	for r := d - 1; r >= out; r-- {
		v := b[r]
		for j := r + 1; j < d; j++ {
			v -= m[r*d+j] * b[j]
		}
		b[r] = v * w.inv[r]
	}
	x = b[out]
	if cmplx.IsNaN(x) || cmplx.IsInf(x) || cmplx.IsNaN(det) {
		return 0, 0, ErrSingular
	}
	return x, det, nil
}

// recip returns 1/z by the textbook formula conj(z)/|z|², scaled by the
// larger component so that |z|² neither overflows nor underflows; faster
// than the runtime's general complex division and as accurate here
// (a few ulps).
func recip(z complex128) complex128 {
	a, b := real(z), imag(z)
	if math.Abs(a) >= math.Abs(b) {
		r := b / a
		den := a + b*r
		return complex(1/den, -r/den)
	}
	r := a / b
	den := a*r + b
	return complex(r/den, -1/den)
}
