package mna

import (
	"math"
	"math/cmplx"
)

// FixedInterpolator computes exactly what Interpolator.Coefficients
// computes, bit for bit, for one netlist, op-amp model, sampling radius and
// coefficient count, in a fraction of the time. It is meant for many
// evaluations of one circuit with part values near reference values
// (Monte Carlo trials, sweeps of one part).
//
// At construction it runs the dense elimination of Workspace.Transfer once
// per sample point with the reference values, notes the pivot rows it
// chooses, and records the operations of that elimination restricted to the
// matrix entries that can be non-zero (the others stay exactly zero in the
// dense elimination: they only ever get a finite number times zero
// subtracted from them). It also factors the interpolation matrix, which
// depends on the sample points only, and tabulates the powers of the
// radius. An evaluation replays the recorded operations, in the same order
// and with the same floating-point expressions as the dense code, and
// checks on the way that the dense elimination would choose the same pivots
// with these values (the same first largest |re| + |im| in each column). A
// real sample point (s = radius) is replayed in real arithmetic, which gives
// the real parts of the complex elimination exactly (every imaginary part
// there is zero).
//
// Skipping a product with an exact zero can only change the sign of a zero
// result, never a non-zero value, as long as the other factor is finite
// (the only divisions are by pivots, which are not zero, and by fixed
// values); and the sign of a zero cannot reach the coefficients, because
// the recovered coefficients' rounding-level zeros are set to +0 (CoefTol)
// before anything divides, except in a polynomial that is zero altogether,
// which the replay leaves to the general path. So when every value an evaluation computes is
// finite and the pivots agree, the result equals the dense one; otherwise
// (a pivot order of its own, an overflow, a singular matrix, slices of
// another length) the evaluation runs the general Interpolator, so errors
// and results stay those of Coefficients in every case.
//
// A FixedInterpolator is not safe for concurrent use. Coefficients does not
// allocate.
type FixedInterpolator struct {
	n      *Netlist
	a      Amp
	radius float64
	m      int
	fast   bool // false: always the general path
	d      int
	pw     powers       // powers of radius, as math.Pow gives them
	pts    []fixedPoint // the samples with imag(z) >= 0, in sample order
	stamp  []stampOp
	ny     int // number of admittance slots (one per element)
	// The interpolation matrix after elimination: multipliers below the
	// diagonal, U on and above it; vp[c] is the pivot row of column c.
	vlu [(MaxDim + 1) * (MaxDim + 1)]float64
	vp  [MaxDim + 1]int

	// Working storage.
	gen   Interpolator // the general path
	y     [maxElements]float64
	yc    [maxElements + nConst]complex128
	yr    [maxElements + nConst]float64
	mc    [MaxDim * MaxDim]complex128
	bc    [MaxDim]complex128
	ic    [MaxDim]complex128
	mr    [MaxDim * MaxDim]float64
	br    [MaxDim]float64
	irr   [MaxDim]float64
	rn    [MaxDim + 1]float64
	rd    [MaxDim + 1]float64
	last  int        // 1 when the last call took the general path (tests)
	lanes *laneStore // allocated by the first CoefficientsLanes
}

// maxElements bounds the elements of a netlist a FixedInterpolator replays
// (larger ones use the general path).
const maxElements = 64

// Stamp sources after the element admittances (slots 0..ny-1): slot
// ny+srcOne holds 1, ny+srcInvA 1/A of the op-amp model at s, ny+srcInvAR
// (1/A)·Rout.
const (
	srcOne = iota
	srcInvA
	srcInvAR
	nConst
)

// stampOp is one "+=" of Workspace.stamp: m[dst] += ±source. first marks
// the first write of dst (an assignment: 0 + v is v up to the sign of a
// zero).
type stampOp struct {
	dst   int32
	src   int32
	neg   bool
	first bool
}

// fixedPoint is one sample point's recorded elimination.
type fixedPoint struct {
	s    complex128
	real bool // imag(s) == 0: replayed in real arithmetic
	row  int  // first row of the interpolation system it fills
	two  bool // it fills two rows (real and imaginary parts)
	e    elimination
}

// elimination is the recorded dense elimination of one sample point.
type elimination struct {
	cols  []elimCol
	cand  []int32 // matrix indices of pivot candidates, per column in row order
	rows  []elimRow
	ops   []int32 // pairs (dst, src): m[dst] −= f·m[src]
	back  []backRow
	terms []int32 // pairs (m index, b index): v −= m·b
	outB  int32   // b index of the output unknown (-1: structurally zero)
	scanM []int32 // every matrix entry written
	scanB []int32 // every right-hand side entry written
}

type elimCol struct {
	cLo, cHi int32 // candidates cand[cLo:cHi]
	pos      int32 // the pivot's position among them
	piv      int32 // matrix index of the pivot
	flip     bool  // a row swap: det = −det
	rLo, rHi int32 // rows[rLo:rHi] below the pivot
	bPiv     int32 // b index of the pivot row, -1 if structurally zero
}

type elimRow struct {
	f        int32 // matrix index of (r, c); the multiplier is stored there
	oLo, oMi int32 // ops[2·oLo:2·oMi] update existing entries
	oHi      int32 // ops[2·oMi:2·oHi] fill entries (dst = −f·src)
	b        int32 // b index of the row
	bFill    bool  // b of the row is structurally zero before this update
}

type backRow struct {
	b        int32 // b index of logical row r
	has      bool  // b(r) structurally non-zero
	tLo, tHi int32 // terms[2·tLo:2·tHi]
	col      int32 // r: the reciprocal pivot used
}

// NewFixedInterpolator records the evaluation of Coefficients(n, · , a,
// radius, num, den) with len(num) = len(den) = m, using the pivot order
// that the reference values ref give. n must pass Check for len(ref). When
// ref give a singular matrix, or the netlist is too large, the result still
// works (it always takes the general path).
func NewFixedInterpolator(n *Netlist, ref []float64, a Amp, radius float64, m int) (*FixedInterpolator, error) {
	if err := n.Check(len(ref)); err != nil {
		return nil, err
	}
	f := &FixedInterpolator{n: n, a: a, radius: radius, m: m, d: n.Dim()}
	if m < n.Degree(a)+1 || m > MaxDim+1 || !(radius > 0) || math.IsInf(radius, 0) ||
		len(n.Elements) > maxElements || CheckValues(ref) != nil {
		return f, nil
	}
	f.pw.fill(radius, m)
	f.ny = len(n.Elements)
	f.stamp = stampProgram(n, a, f.d)
	// Sample points exactly as Interpolator.scaled places them.
	var zs [MaxDim + 1]complex128
	for k := range m {
		theta := 0.0
		if m > 1 {
			theta = math.Pi * (float64(k)/float64(m-1) - 0.5)
		}
		zs[k] = cmplx.Rect(1, theta)
	}
	row := 0
	for k := range m {
		if imag(zs[k]) < 0 {
			continue
		}
		s := complex(radius, 0) * zs[k]
		var ws Workspace
		var piv [MaxDim]int
		d := ws.stamp(n, ref, a, s)
		if _, _, err := ws.solveRec(d, n.Out-1, &piv); err != nil {
			return f, nil
		}
		e, ok := record(f.stamp, f.d, n.Nodes, n.Out-1, piv[:f.d])
		if !ok {
			return f, nil
		}
		p := fixedPoint{s: s, real: imag(s) == 0, e: e}
		if row < m {
			p.row = row
			p.two = imag(zs[k]) > 1e-300 && row+1 < m
			row++
			if p.two {
				row++
			}
		} else {
			p.row = -1
		}
		f.pts = append(f.pts, p)
	}
	// The interpolation matrix, as scaled builds it, and its elimination
	// as solveReal performs it.
	v := f.vlu[:m*m]
	interpMatrix(v, zs[:], m)
	for c := range m {
		p, best := c, 0.0
		for r := c; r < m; r++ {
			if a := math.Abs(v[r*m+c]); a > best {
				p, best = r, a
			}
		}
		if best == 0 {
			return f, nil
		}
		f.vp[c] = p
		if p != c {
			// Columns left of c hold the multipliers of earlier columns,
			// which stay with the row positions they were applied at (in
			// solveReal those columns are never read again).
			for j := c; j < m; j++ {
				v[p*m+j], v[c*m+j] = v[c*m+j], v[p*m+j]
			}
		}
		inv := 1 / v[c*m+c]
		for r := c + 1; r < m; r++ {
			fr := v[r*m+c] * inv
			for j := c + 1; j < m; j++ {
				v[r*m+j] -= fr * v[c*m+j]
			}
			v[r*m+c] = fr // the multiplier, kept for the right-hand sides
		}
	}
	f.fast = true
	return f, nil
}

// stampProgram lists the "+=" of Workspace.stamp in its order, leaving out
// the contributions that are zero for every s (the 1/A terms of an ideal
// op-amp).
func stampProgram(n *Netlist, a Amp, d int) []stampOp {
	var ops []stampOp
	ny := int32(len(n.Elements))
	written := make([]bool, d*d)
	add := func(idx int, src int32, neg bool) {
		ops = append(ops, stampOp{dst: int32(idx), src: src, neg: neg, first: !written[idx]})
		written[idx] = true
	}
	node := func(i, j int, src int32, neg bool) {
		if i > 0 && j > 0 {
			add((i-1)*d+(j-1), src, neg)
		}
	}
	src := n.Nodes
	add((n.In-1)*d+src, ny+srcOne, false)
	add(src*d+(n.In-1), ny+srcOne, false)
	ideal := a.invDC() == 0 && a.invWt() == 0
	k := src + 1
	for i, e := range n.Elements {
		switch e.Kind {
		case Resistor, Capacitor:
			node(e.A, e.A, int32(i), false)
			node(e.B, e.B, int32(i), false)
			node(e.A, e.B, int32(i), true)
			node(e.B, e.A, int32(i), true)
		case OpAmp:
			add((e.Out-1)*d+k, ny+srcOne, true)
			if e.A > 0 {
				add(k*d+e.A-1, ny+srcOne, false)
			}
			if e.B > 0 {
				add(k*d+e.B-1, ny+srcOne, true)
			}
			if !ideal {
				add(k*d+e.Out-1, ny+srcInvA, true)
				if a.ROutOhm != 0 {
					add(k*d+k, ny+srcInvAR, true)
				}
			}
			k++
		}
	}
	return ops
}

// record replays the dense elimination of solve structurally, with the
// pivot rows piv[c] (in the current row order, as solve chose them), and
// returns the operations on the entries that can be non-zero.
func record(stamp []stampOp, d, src, out int, piv []int) (elimination, bool) {
	var e elimination
	nz := make([]bool, d*d)
	bnz := make([]bool, d)
	for _, op := range stamp {
		nz[op.dst] = true
	}
	bnz[src] = true
	wm := append([]bool(nil), nz...)
	wb := append([]bool(nil), bnz...)
	perm := make([]int, d) // logical row -> physical row
	for i := range perm {
		perm[i] = i
	}
	for c := range d {
		col := elimCol{cLo: int32(len(e.cand)), pos: -1, bPiv: -1}
		for r := c; r < d; r++ {
			if nz[perm[r]*d+c] {
				if r == piv[c] {
					col.pos = int32(len(e.cand)) - col.cLo
				}
				e.cand = append(e.cand, int32(perm[r]*d+c))
			}
		}
		col.cHi = int32(len(e.cand))
		if col.pos < 0 {
			return e, false
		}
		if p := piv[c]; p != c {
			perm[p], perm[c] = perm[c], perm[p]
			col.flip = true
		}
		pr := perm[c]
		col.piv = int32(pr*d + c)
		if bnz[pr] {
			col.bPiv = int32(pr)
		}
		col.rLo = int32(len(e.rows))
		for r := c + 1; r < d; r++ {
			rr := perm[r]
			if !nz[rr*d+c] {
				continue
			}
			row := elimRow{f: int32(rr*d + c), oLo: int32(len(e.ops) / 2), b: int32(rr)}
			var fills []int32
			for j := c + 1; j < d; j++ {
				if !nz[pr*d+j] {
					continue
				}
				if nz[rr*d+j] {
					e.ops = append(e.ops, int32(rr*d+j), int32(pr*d+j))
				} else {
					fills = append(fills, int32(rr*d+j), int32(pr*d+j))
				}
			}
			row.oMi = int32(len(e.ops) / 2)
			e.ops = append(e.ops, fills...)
			row.oHi = int32(len(e.ops) / 2)
			for i := 0; i < len(fills); i += 2 {
				nz[fills[i]] = true
				wm[fills[i]] = true
			}
			if bnz[pr] {
				row.bFill = !bnz[rr]
				bnz[rr] = true
				wb[rr] = true
			}
			e.rows = append(e.rows, row)
		}
		col.rHi = int32(len(e.rows))
		e.cols = append(e.cols, col)
	}
	for r := d - 1; r >= out; r-- {
		rr := perm[r]
		br := backRow{b: int32(rr), has: bnz[rr], tLo: int32(len(e.terms) / 2), col: int32(r)}
		for j := r + 1; j < d; j++ {
			if nz[rr*d+j] && bnz[perm[j]] {
				e.terms = append(e.terms, int32(rr*d+j), int32(perm[j]))
			}
		}
		br.tHi = int32(len(e.terms) / 2)
		if !br.has && br.tHi == br.tLo {
			continue // b(r) stays exactly zero
		}
		bnz[rr] = true
		wb[rr] = true
		e.back = append(e.back, br)
	}
	e.outB = -1
	if bnz[perm[out]] {
		e.outB = int32(perm[out])
	}
	for i, w := range wm {
		if w {
			e.scanM = append(e.scanM, int32(i))
		}
	}
	for i, w := range wb {
		if w {
			e.scanB = append(e.scanB, int32(i))
		}
	}
	return e, true
}

// Coefficients returns what Interpolator.Coefficients(n, values, a,
// radius, num, den) returns for the netlist, op-amp model and radius given
// to NewFixedInterpolator, bit for bit. values must have the length the
// netlist was checked for. It does not allocate.
func (f *FixedInterpolator) Coefficients(values []float64, num, den []float64) error {
	if f.fast && len(num) == f.m && len(den) == f.m && f.replay(values) {
		f.last = 0
		return finish(&f.rn, &f.rd, f.m, &f.pw, num, den)
	}
	f.last = 1
	return f.gen.Coefficients(f.n, values, f.a, f.radius, num, den)
}

// replay leaves in f.rn and f.rd what Interpolator.scaled leaves in its rn
// and rd, and reports false when the general path must run instead.
func (f *FixedInterpolator) replay(values []float64) bool {
	y := f.y[:f.ny]
	for i, e := range f.n.Elements {
		if e.Kind == Resistor {
			y[i] = 1 / values[e.Value]
		}
	}
	m := f.m
	rn, rd := &f.rn, &f.rd
	for i := range f.pts {
		p := &f.pts[i]
		var h, det complex128
		var ok bool
		if p.real {
			var hr, dr float64
			hr, dr, ok = f.solveReal(p, values)
			h, det = complex(hr, 0), complex(dr, 0)
		} else {
			h, det, ok = f.solveComplex(p, values)
		}
		if !ok {
			return false
		}
		if p.row < 0 {
			continue
		}
		pn := h * det
		rn[p.row], rd[p.row] = real(pn), real(det)
		if p.two {
			rn[p.row+1], rd[p.row+1] = imag(pn), imag(det)
		}
	}
	// solveReal of the interpolation system with its recorded factors.
	v := f.vlu[:m*m]
	for c := range m {
		if p := f.vp[c]; p != c {
			rn[p], rn[c] = rn[c], rn[p]
			rd[p], rd[c] = rd[c], rd[p]
		}
		for r := c + 1; r < m; r++ {
			fr := v[r*m+c]
			rn[r] -= fr * rn[c]
			rd[r] -= fr * rd[c]
		}
	}
	backSubstitute(v, rn[:], rd[:], m)
	// A polynomial that is zero altogether keeps the signs of its zeros
	// through finish (nothing sets them to +0), and those signs are the
	// one thing the replay does not reproduce: leave it to the general
	// path (an output not connected to the input, or a singular case).
	nzn, nzd := false, false
	for j := range m {
		nzn = nzn || rn[j] != 0
		nzd = nzd || rd[j] != 0
	}
	return nzn && nzd
}

// solveComplex replays the elimination of one complex sample point and
// returns V(out) and the determinant.
func (f *FixedInterpolator) solveComplex(p *fixedPoint, values []float64) (x, det complex128, ok bool) {
	m, b, inv := &f.mc, &f.bc, &f.ic
	s := p.s
	yv := &f.yc
	for i, e := range f.n.Elements {
		switch e.Kind {
		case Resistor:
			yv[i] = complex(f.y[i], 0)
		case Capacitor:
			// s·complex(C, 0) of stamp: (Re s·C − Im s·0) + (Re s·0 + Im s·C)i.
			c := values[e.Value]
			yv[i] = complex(real(s)*c, imag(s)*c)
		}
	}
	invA := complex(f.a.invDC(), 0) + s*complex(f.a.invWt(), 0)
	yv[f.ny+srcOne] = 1
	yv[f.ny+srcInvA] = invA
	yv[f.ny+srcInvAR] = invA * complex(f.a.ROutOhm, 0)
	for _, op := range f.stamp {
		v := yv[op.src]
		if op.neg {
			v = -v
		}
		if op.first {
			m[op.dst] = v
		} else {
			m[op.dst] += v
		}
	}
	b[f.n.Nodes] = 1
	el := &p.e
	det = 1
	for c := range el.cols {
		col := &el.cols[c]
		cand := el.cand[col.cLo:col.cHi]
		best := l1(m[cand[col.pos]])
		if !(best > 0) || math.IsInf(best, 0) {
			return 0, 0, false
		}
		for i, idx := range cand {
			a := l1(m[idx])
			if int32(i) < col.pos && !(a < best) || int32(i) > col.pos && !(a <= best) {
				return 0, 0, false
			}
		}
		if col.flip {
			det = -det
		}
		piv := m[col.piv]
		det *= piv
		iv := recip(piv)
		inv[c] = iv
		for _, row := range el.rows[col.rLo:col.rHi] {
			fr := m[row.f] * iv
			m[row.f] = fr
			ops := el.ops[2*row.oLo : 2*row.oHi]
			nu := 2 * (row.oMi - row.oLo)
			for k := int32(0); k < nu; k += 2 {
				m[ops[k]] -= fr * m[ops[k+1]]
			}
			for k := nu; k < int32(len(ops)); k += 2 {
				m[ops[k]] = -(fr * m[ops[k+1]])
			}
			if col.bPiv >= 0 {
				if row.bFill {
					b[row.b] = -(fr * b[col.bPiv])
				} else {
					b[row.b] -= fr * b[col.bPiv]
				}
			}
		}
	}
	for _, br := range el.back {
		var v complex128
		if br.has {
			v = b[br.b]
		}
		t := el.terms[2*br.tLo : 2*br.tHi]
		for k := 0; k < len(t); k += 2 {
			if k == 0 && !br.has {
				v = -(m[t[0]] * b[t[1]])
				continue
			}
			v -= m[t[k]] * b[t[k+1]]
		}
		b[br.b] = v * inv[br.col]
	}
	if el.outB >= 0 {
		x = b[el.outB]
	}
	// Every value computed must be finite (see FixedInterpolator).
	acc := 0.0
	for _, i := range el.scanM {
		acc += real(m[i])*0 + imag(m[i])*0
	}
	for _, i := range el.scanB {
		acc += real(b[i])*0 + imag(b[i])*0
	}
	for c := range el.cols {
		acc += real(inv[c])*0 + imag(inv[c])*0
	}
	if acc != 0 || cmplxNaN(det) {
		return 0, 0, false
	}
	return x, det, true
}

// solveReal is solveComplex for a real sample point, in real arithmetic.
func (f *FixedInterpolator) solveReal(p *fixedPoint, values []float64) (x, det float64, ok bool) {
	m, b, inv := &f.mr, &f.br, &f.irr
	s := real(p.s)
	yv := &f.yr
	for i, e := range f.n.Elements {
		switch e.Kind {
		case Resistor:
			yv[i] = f.y[i]
		case Capacitor:
			yv[i] = s * values[e.Value]
		}
	}
	invA := f.a.invDC() + s*f.a.invWt()
	yv[f.ny+srcOne] = 1
	yv[f.ny+srcInvA] = invA
	yv[f.ny+srcInvAR] = invA * f.a.ROutOhm
	for _, op := range f.stamp {
		v := yv[op.src]
		if op.neg {
			v = -v
		}
		if op.first {
			m[op.dst] = v
		} else {
			m[op.dst] += v
		}
	}
	b[f.n.Nodes] = 1
	el := &p.e
	det = 1
	for c := range el.cols {
		col := &el.cols[c]
		cand := el.cand[col.cLo:col.cHi]
		best := math.Abs(m[cand[col.pos]])
		if !(best > 0) || math.IsInf(best, 0) {
			return 0, 0, false
		}
		for i, idx := range cand {
			a := math.Abs(m[idx])
			if int32(i) < col.pos && !(a < best) || int32(i) > col.pos && !(a <= best) {
				return 0, 0, false
			}
		}
		if col.flip {
			det = -det
		}
		piv := m[col.piv]
		det *= piv
		iv := 1 / piv
		inv[c] = iv
		for _, row := range el.rows[col.rLo:col.rHi] {
			fr := m[row.f] * iv
			m[row.f] = fr
			ops := el.ops[2*row.oLo : 2*row.oHi]
			nu := 2 * (row.oMi - row.oLo)
			for k := int32(0); k < nu; k += 2 {
				m[ops[k]] -= fr * m[ops[k+1]]
			}
			for k := nu; k < int32(len(ops)); k += 2 {
				m[ops[k]] = -(fr * m[ops[k+1]])
			}
			if col.bPiv >= 0 {
				if row.bFill {
					b[row.b] = -(fr * b[col.bPiv])
				} else {
					b[row.b] -= fr * b[col.bPiv]
				}
			}
		}
	}
	for _, br := range el.back {
		var v float64
		if br.has {
			v = b[br.b]
		}
		t := el.terms[2*br.tLo : 2*br.tHi]
		for k := 0; k < len(t); k += 2 {
			if k == 0 && !br.has {
				v = -(m[t[0]] * b[t[1]])
				continue
			}
			v -= m[t[k]] * b[t[k+1]]
		}
		b[br.b] = v * inv[br.col]
	}
	if el.outB >= 0 {
		x = b[el.outB]
	}
	acc := 0.0
	for _, i := range el.scanM {
		acc += m[i] * 0
	}
	for _, i := range el.scanB {
		acc += b[i] * 0
	}
	for c := range el.cols {
		acc += inv[c] * 0
	}
	if acc != 0 || math.IsNaN(det) {
		return 0, 0, false
	}
	return x, det, true
}

func l1(v complex128) float64 { return math.Abs(real(v)) + math.Abs(imag(v)) }

func cmplxNaN(z complex128) bool { return math.IsNaN(real(z)) || math.IsNaN(imag(z)) }
