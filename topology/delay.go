package topology

import (
	"math"

	"github.com/rolloff/rolloff/response"
)

// Circuits and chains give their group delay analytically, so that
// response.Sweep of a circuit or chain reports an exact delay instead of a
// numeric derivative of the phase.
var (
	_ response.Delayer = Circuit{}
	_ response.Delayer = Chain{}
)

// DelayS returns the group delay −d arg H(jω)/dω of the biquad at f hertz,
// in seconds, from its coefficients: for a real polynomial
// P(jω) = a(ω) + j·b(ω), d arg P/dω = (a·b′ − b·a′)/(a² + b²), and the
// delay is that of the denominator minus that of the numerator. At a zero
// of the numerator on the jω axis the numerator's term is left out (the
// phase jumps there by π and its derivative is 0 on either side). It does
// not allocate.
func (b Biquad) DelayS(f float64) float64 {
	w := 2 * math.Pi * f
	return argSlope(b.Den, w) - argSlope(b.Num, w)
}

// argSlope returns d arg P(jω)/dω for P(s) = p[0] + p[1]·s + p[2]·s².
func argSlope(p [3]float64, w float64) float64 {
	a, da := p[0]-p[2]*w*w, -2*p[2]*w
	b, db := p[1]*w, p[1]
	m := a*a + b*b
	if m == 0 {
		return 0
	}
	return (a*db - b*da) / m
}

// DelayAtHz returns the circuit's group delay at f hertz in seconds,
// computed from the polynomial coefficients that nodal analysis of its parts
// gives (Biquad), with ideal op-amps. It implements response.Delayer and
// does not allocate. A Circuit that fits no template gives NaN.
func (c Circuit) DelayAtHz(f float64) float64 {
	b, err := c.Biquad()
	if err != nil {
		return math.NaN()
	}
	return b.DelayS(f)
}

// DelayAtHz returns the chain's group delay at f hertz in seconds: the sum
// of its circuits' delays. It implements response.Delayer and does not
// allocate.
func (c Chain) DelayAtHz(f float64) float64 {
	t := 0.0
	for _, ci := range c.Circuits {
		t += ci.DelayAtHz(f)
	}
	return t
}
