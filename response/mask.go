package response

import (
	"fmt"
	"math"

	"github.com/rolloff/rolloff/filter"
)

// Region names a band of a mask.
type Region int

// The regions of a mask. Lowpass and highpass masks have a Passband and a
// Stopband; bandpass masks a Passband and a LowerStopband and
// UpperStopband; bandstop masks a LowerPassband, UpperPassband and a
// Stopband.
const (
	Passband Region = iota + 1
	Stopband
	LowerStopband
	UpperStopband
	LowerPassband
	UpperPassband
)

// String returns the region's name in lower case, e.g. "lower stopband".
func (r Region) String() string {
	switch r {
	case Passband:
		return "passband"
	case Stopband:
		return "stopband"
	case LowerStopband:
		return "lower stopband"
	case UpperStopband:
		return "upper stopband"
	case LowerPassband:
		return "lower passband"
	case UpperPassband:
		return "upper passband"
	}
	return fmt.Sprintf("Region(%d)", int(r))
}

// MaskTolDB is the slack, in dB, that CheckMask allows on every limit of a
// mask: a response computed to rounding that touches a limit exactly (a
// Chebyshev passband at its ripple edge, a maximum at 0 dB) passes. It is
// filter.MaskToleranceDB, the allowance filter.Design works to, so every
// Design result passes: 1e-6 dB is an amplitude error of 1.2e-7, far below
// anything a circuit can resolve and far above the rounding of a computed
// response.
const MaskTolDB = filter.MaskToleranceDB

// MaskSpan is how far beyond its edge CheckMask searches a band that is
// open on one side (a lowpass passband towards DC, its stopband towards
// infinity): a factor of 1e4 in frequency, four decades.
const MaskSpan = 1e4

// RegionMargin is the result of a mask check over one region.
type RegionMargin struct {
	Region     Region
	LoHz, HiHz float64 // the frequencies searched
	MarginDB   float64 // least distance of the gain inside its limits; negative when outside
	WorstHz    float64 // where the margin is least
}

// MaskResult is the outcome of CheckMask.
type MaskResult struct {
	Pass     bool           // every region has MarginDB ≥ 0
	MarginDB float64        // the least margin over all regions; negative when failing
	WorstHz  float64        // where that least margin occurs
	Worst    Region         // in which region
	Regions  []RegionMargin // one per region of the mask, in ascending frequency
}

// CheckMask reports whether the gain of sys meets spec. The limits are
// absolute: in a passband the gain must lie within [−RippleDB, 0] dB, in a
// stopband at or below −AttenDB, each limit with a slack of MaskTolDB. So a
// response must be normalized to a 0 dB passband maximum (the normalization
// of every filter.Family prototype); a system with gain should be divided
// by it first.
//
// Regions, from spec.Band (element 1 of the edges ignored for lowpass and
// highpass):
//
//	Lowpass:  passband [PassHz[0]/MaskSpan, PassHz[0]], stopband [StopHz[0], StopHz[0]·MaskSpan]
//	Highpass: stopband [StopHz[0]/MaskSpan, StopHz[0]], passband [PassHz[0], PassHz[0]·MaskSpan]
//	Bandpass: lower stopband [StopHz[0]/MaskSpan, StopHz[0]], passband [PassHz[0], PassHz[1]],
//	          upper stopband [StopHz[1], StopHz[1]·MaskSpan]
//	Bandstop: lower passband [PassHz[0]/MaskSpan, PassHz[0]], stopband [StopHz[0], StopHz[1]],
//	          upper passband [PassHz[1], PassHz[1]·MaskSpan]
//
// Each region is scanned on a 400-a-decade log grid and every local extremum
// of the grid is refined by golden-section search (see GainExtremes), so a
// violation narrower than the grid spacing is found; for a filter.Transfer
// the frequencies of its poles and zeros are added to the grid, so even a
// resonance far narrower than the spacing is found. With gmin, gmax the
// refined extremes of a region, the margin of a stopband is
// −AttenDB − gmax + MaskTolDB and that of a passband
// gmin + RippleDB + MaskTolDB, or MaskTolDB − gmax when that is lower and
// negative: the 0 dB ceiling counts only when it is exceeded, because a
// normalized response touches it by construction and it would otherwise
// always be the least margin, hiding the slack a designer wants to see.
//
// Errors wrap filter.ErrSpec for a spec that fails filter.Spec.Validate,
// ErrGrid for an edge above MaxSearchHz, and
// ErrSystem for a nil sys or when the gain of sys is NaN in a region.
func CheckMask(sys System, spec filter.Spec) (MaskResult, error) {
	if err := checkSystem(sys); err != nil {
		return MaskResult{}, err
	}
	if err := spec.Validate(); err != nil {
		return MaskResult{}, fmt.Errorf("response: mask: %w", err)
	}
	p, t := spec.PassHz, spec.StopHz
	type reg struct {
		r      Region
		lo, hi float64
		pass   bool
	}
	var regs []reg
	switch spec.Band {
	case filter.Lowpass:
		regs = []reg{{Passband, below(p[0]), p[0], true}, {Stopband, t[0], above(t[0]), false}}
	case filter.Highpass:
		regs = []reg{{Stopband, below(t[0]), t[0], false}, {Passband, p[0], above(p[0]), true}}
	case filter.Bandpass:
		regs = []reg{{LowerStopband, below(t[0]), t[0], false}, {Passband, p[0], p[1], true},
			{UpperStopband, t[1], above(t[1]), false}}
	case filter.Bandstop:
		regs = []reg{{LowerPassband, below(p[0]), p[0], true}, {Stopband, t[0], t[1], false},
			{UpperPassband, p[1], above(p[1]), true}}
	}
	res := MaskResult{MarginDB: math.Inf(1), Regions: make([]RegionMargin, 0, len(regs))}
	for _, g := range regs {
		if err := checkBand("region low edge", g.lo, "region high edge", g.hi); err != nil {
			return MaskResult{}, fmt.Errorf("response: %v of the mask: %w", g.r, err)
		}
		sc, err := newScan(sys, g.lo, g.hi)
		if err != nil {
			return MaskResult{}, err
		}
		maxHz, maxDB, err := sc.extreme(1)
		if err != nil {
			return MaskResult{}, err
		}
		rm := RegionMargin{Region: g.r, LoHz: g.lo, HiHz: g.hi,
			MarginDB: -spec.AttenDB - maxDB + MaskTolDB, WorstHz: maxHz}
		if g.pass {
			minHz, minDB, err := sc.extreme(-1)
			if err != nil {
				return MaskResult{}, err
			}
			rm.MarginDB, rm.WorstHz = minDB+spec.RippleDB+MaskTolDB, minHz
			if m := -maxDB + MaskTolDB; m < 0 && m < rm.MarginDB {
				rm.MarginDB, rm.WorstHz = m, maxHz
			}
		}
		res.Regions = append(res.Regions, rm)
		if rm.MarginDB < res.MarginDB {
			res.MarginDB, res.WorstHz, res.Worst = rm.MarginDB, rm.WorstHz, rm.Region
		}
	}
	res.Pass = res.MarginDB >= 0
	return res, nil
}

// below and above extend an edge by MaskSpan towards DC or infinity,
// staying inside the float64 range and (above) below MaxSearchHz unless the
// edge itself is above it (which checkBand then reports).
func below(edge float64) float64 {
	if lo := edge / MaskSpan; lo > 0 {
		return lo
	}
	return edge
}

func above(edge float64) float64 {
	return math.Min(edge*MaskSpan, math.Max(edge, MaxSearchHz))
}
