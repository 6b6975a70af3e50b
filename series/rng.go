package series

import "math/rand/v2"

// Per-trial random streams. Trial i of a run seeded with seed draws from its
// own PCG generator (math/rand/v2) whose 128-bit state is derived from
// (seed, i) by the SplitMix64 finalizer, so a trial's values depend only on
// (seed, i): not on the number of workers, nor on which worker ran it, nor
// on the order trials ran in.

// mix64 is the SplitMix64 output function (Steele, Lea and Flood, "Fast
// splittable pseudorandom number generators", OOPSLA 2014; constants from
// memory of the reference implementation).
func mix64(z uint64) uint64 {
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

const golden64 = 0x9e3779b97f4a7c15

// trialSeed returns the PCG state of trial i of a run seeded with seed.
func trialSeed(seed, i uint64) (hi, lo uint64) {
	a := mix64(seed + golden64*(2*i+1))
	b := mix64(a ^ mix64(seed^golden64) ^ i)
	return a, b
}

// stream is one worker's generator, reseeded per trial; it does not
// allocate after newStream.
type stream struct {
	pcg *rand.PCG
	r   *rand.Rand
}

func newStream() stream {
	p := rand.NewPCG(0, 0)
	return stream{pcg: p, r: rand.New(p)}
}

func (s stream) reset(seed, i uint64) { s.pcg.Seed(trialSeed(seed, i)) }

// Distribution is the distribution of a part's value around its nominal
// value in tolerance analysis.
type Distribution int

// The distributions. With tolerance t (a fraction) and nominal value x:
//
//	Uniform: x·(1 + t·u), u uniform on [−1, 1): every value within ±t
//	         equally likely (the zero value).
//	Normal:  x·(1 + t·z/3), z standard normal: the tolerance is ±3σ, so
//	         99.73 % of parts are within it (not truncated: a trial whose
//	         drawn value is not positive counts as failed).
const (
	Uniform Distribution = iota
	Normal
)

// String returns "uniform", "normal" or "Distribution(n)".
func (d Distribution) String() string {
	switch d {
	case Uniform:
		return "uniform"
	case Normal:
		return "normal"
	}
	return "Distribution(" + itoa(int(d)) + ")"
}

func itoa(i int) string {
	if i < 0 {
		return "-" + itoa(-i)
	}
	if i < 10 {
		return string(rune('0' + i))
	}
	return itoa(i/10) + string(rune('0'+i%10))
}
