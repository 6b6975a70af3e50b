package filter

import (
	"math"
)

// Band is the kind of frequency band a filter passes.
type Band int

// The bands. The zero value is not a valid band.
const (
	Lowpass Band = iota + 1
	Highpass
	Bandpass
	Bandstop
)

// String returns "lowpass", "highpass", "bandpass" or "bandstop", or
// "Band(n)" for an invalid value.
func (b Band) String() string {
	switch b {
	case Lowpass:
		return "lowpass"
	case Highpass:
		return "highpass"
	case Bandpass:
		return "bandpass"
	case Bandstop:
		return "bandstop"
	}
	return "Band(" + itoa(int(b)) + ")"
}

// Transfer is a transfer function in factored form,
//
//	H(s) = Gain · Π(s − Zeros[i]) / Π(s − Poles[i]),
//
// with s in rad/s. Complex poles and zeros come in conjugate pairs for every
// Transfer this package returns, so H is real for real s. The zero value is
// H(s) = 0.
type Transfer struct {
	Zeros, Poles []complex128
	Gain         float64
}

// At returns H(s). The product is evaluated interleaved, a zero factor and a
// pole factor at a time, so that high orders neither overflow nor underflow
// where the result itself is representable. At does not allocate.
//
// Special cases are: At at a pole returns a complex infinity; a zero Gain
// gives 0.
func (h Transfer) At(s complex128) complex128 {
	v := complex(h.Gain, 0)
	nz, np := len(h.Zeros), len(h.Poles)
	n := max(nz, np)
	for i := range n {
		switch {
		case i < nz && i < np:
			v *= (s - h.Zeros[i]) / (s - h.Poles[i])
		case i < np:
			v /= s - h.Poles[i]
		default:
			v *= s - h.Zeros[i]
		}
	}
	return v
}

// AtHz returns H(j·2π·f), the frequency response at f hertz. It does not
// allocate.
func (h Transfer) AtHz(f float64) complex128 {
	return h.At(complex(0, 2*math.Pi*f))
}

// itoa formats small integers without importing strconv into hot files.
func itoa(n int) string {
	if n == 0 {
		return "0"
	}
	neg := n < 0
	if neg {
		n = -n
	}
	var b [20]byte
	i := len(b)
	for n > 0 {
		i--
		b[i] = byte('0' + n%10)
		n /= 10
	}
	if neg {
		i--
		b[i] = '-'
	}
	return string(b[i:])
}
