package response

import (
	"fmt"
	"math"
)

// HalfPowerDB is 10·log10(2) ≈ 3.0103 dB, the drop of the half-power
// (−3 dB) bandwidth.
const HalfPowerDB = 3.010299956639812

// Extremes are the largest and smallest gain of a system over a band, with
// the frequencies where they occur.
type Extremes struct {
	MaxDB, MaxHz float64
	MinDB, MinHz float64
}

// RippleDB returns MaxDB − MinDB, the peak-to-peak variation of the gain
// over the band (the passband ripple when the band is a passband).
func (e Extremes) RippleDB() float64 { return e.MaxDB - e.MinDB }

// GainExtremes returns the largest and smallest gain of s over
// [loHz, hiHz], refined between the points of a 400-a-decade log grid by
// golden-section search in log f around every local extremum of the grid
// (so a narrow peak or dip between grid points is found; for a
// filter.Transfer the frequencies of its poles and zeros join the grid, so
// that even a resonance far narrower than the grid spacing is); the values are
// exact to rounding at the refined frequencies, which are accurate to about
// 1e-7 relative (an extremum is flat).
//
// Errors wrap ErrGrid for a bad band (loHz not positive and finite, hiHz
// not above it) and ErrSystem for a nil s or when the gain of s is NaN in
// the band.
func GainExtremes(s System, loHz, hiHz float64) (Extremes, error) {
	if err := checkSystem(s); err != nil {
		return Extremes{}, err
	}
	if err := checkBand("loHz", loHz, "hiHz", hiHz); err != nil {
		return Extremes{}, err
	}
	sc, err := newScan(s, loHz, hiHz)
	if err != nil {
		return Extremes{}, err
	}
	var e Extremes
	if e.MaxHz, e.MaxDB, err = sc.extreme(1); err != nil {
		return Extremes{}, err
	}
	if e.MinHz, e.MinDB, err = sc.extreme(-1); err != nil {
		return Extremes{}, err
	}
	return e, nil
}

// PassbandRippleDB returns the passband ripple of s over [loHz, hiHz]: the
// largest minus the smallest gain, in dB (see GainExtremes for accuracy and
// errors).
func PassbandRippleDB(s System, loHz, hiHz float64) (float64, error) {
	e, err := GainExtremes(s, loHz, hiHz)
	if err != nil {
		return 0, err
	}
	return e.RippleDB(), nil
}

// StopbandAttenDB returns the least attenuation of s over the stopband
// [loHz, hiHz], in dB (minus the largest gain there), and the frequency
// where it occurs (see GainExtremes for accuracy and errors).
func StopbandAttenDB(s System, loHz, hiHz float64) (attenDB, atHz float64, err error) {
	db, hz, err := PeakGain(s, loHz, hiHz)
	if err != nil {
		return 0, 0, err
	}
	return -db, hz, nil
}

// PeakGain returns the largest gain of s over [loHz, hiHz], in dB, and the
// frequency where it occurs, refined between grid points (see GainExtremes
// for accuracy and errors).
func PeakGain(s System, loHz, hiHz float64) (gainDB, atHz float64, err error) {
	if err := checkSystem(s); err != nil {
		return 0, 0, err
	}
	if err := checkBand("loHz", loHz, "hiHz", hiHz); err != nil {
		return 0, 0, err
	}
	sc, err := newScan(s, loHz, hiHz)
	if err != nil {
		return 0, 0, err
	}
	hz, db, err := sc.extreme(1)
	if err != nil {
		return 0, 0, err
	}
	return db, hz, nil
}

// Edges are the band edges of a response around its peak.
type Edges struct {
	LowerHz float64 // highest frequency below the peak where the gain has dropped; 0 if none in the band
	UpperHz float64 // lowest frequency above the peak where the gain has dropped; +Inf if none in the band
	PeakHz  float64 // where the gain peaks in the band searched
	PeakDB  float64 // the peak gain
}

// WidthHz returns UpperHz − LowerHz: the bandwidth (the corner frequency of
// a lowpass, +Inf for a highpass).
func (e Edges) WidthHz() float64 { return e.UpperHz - e.LowerHz }

// Bandwidth finds the peak gain of s over [loHz, hiHz] and the nearest
// frequencies below and above it where the gain has fallen dropDB below
// that peak (HalfPowerDB for the −3 dB bandwidth): for a lowpass,
// LowerHz = 0 and UpperHz the corner; for a highpass, LowerHz the corner and
// UpperHz = +Inf; for a bandpass both edges. Edges are accurate to 1e-12
// relative (see CrossingHz), the peak as in GainExtremes. Note that the drop
// is from the peak, so for a filter with passband ripple it is measured
// from the ripple maximum.
//
// Errors wrap ErrGrid for a bad band or a dropDB that is not positive and
// finite, and ErrSystem for a nil s or when the gain of s is NaN in the
// band.
func Bandwidth(s System, dropDB, loHz, hiHz float64) (Edges, error) {
	if err := checkSystem(s); err != nil {
		return Edges{}, err
	}
	if !(dropDB > 0) || math.IsInf(dropDB, 0) {
		return Edges{}, fmt.Errorf("response: dropDB %g is not positive and finite: %w", dropDB, ErrGrid)
	}
	if err := checkBand("loHz", loHz, "hiHz", hiHz); err != nil {
		return Edges{}, err
	}
	sc, err := newScan(s, loHz, hiHz)
	if err != nil {
		return Edges{}, err
	}
	e := Edges{UpperHz: math.Inf(1)}
	if e.PeakHz, e.PeakDB, err = sc.extreme(1); err != nil {
		return Edges{}, err
	}
	level := e.PeakDB - dropDB
	if e.PeakHz > loHz {
		below, err := newScan(s, loHz, e.PeakHz)
		if err != nil {
			return Edges{}, err
		}
		f, ok, err := below.crossing(level, true)
		if err != nil {
			return Edges{}, err
		}
		if ok {
			e.LowerHz = f
		}
	}
	if e.PeakHz < hiHz {
		above, err := newScan(s, e.PeakHz, hiHz)
		if err != nil {
			return Edges{}, err
		}
		f, ok, err := above.crossing(level, false)
		if err != nil {
			return Edges{}, err
		}
		if ok {
			e.UpperHz = f
		}
	}
	return e, nil
}
