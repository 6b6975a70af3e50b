package mna

import "math"

// Lanes is the number of value sets FixedInterpolator.CoefficientsLanes
// evaluates together.
const Lanes = 4

// laneStore is the working storage of CoefficientsLanes: every entry holds
// one value per lane.
type laneStore struct {
	mr  [MaxDim * MaxDim][Lanes]float64
	br  [MaxDim][Lanes]float64
	ir  [MaxDim][Lanes]float64
	mc  [MaxDim * MaxDim][Lanes]complex128
	bc  [MaxDim][Lanes]complex128
	ic  [MaxDim][Lanes]complex128
	y   [maxElements][Lanes]float64
	yr  [maxElements + nConst][Lanes]float64
	yc  [maxElements + nConst][Lanes]complex128
	rn  [Lanes][MaxDim + 1]float64
	rd  [Lanes][MaxDim + 1]float64
	bad [Lanes]bool
	v   [Lanes][]float64
}

// CoefficientsLanes sets errs[i] = Coefficients(values[i], num[i], den[i])
// for up to Lanes value sets (len(values) <= Lanes; num, den and errs at
// least as long), with the same results bit for bit. The eliminations of
// the sets are replayed side by side, each operation once per lane, so that
// their chains of dependent floating-point operations overlap: faster than
// one set after another. A set whose pivots differ from the recorded ones,
// or that overflows, takes the general path on its own. It allocates its
// working storage (about 50 KB) on its first call only.
func (f *FixedInterpolator) CoefficientsLanes(values [][]float64, num, den [][]float64, errs []error) {
	n := len(values)
	if n > Lanes {
		panic("mna: CoefficientsLanes of more than Lanes value sets")
	}
	if n == 0 {
		return
	}
	ok := f.fast
	for i := range n {
		ok = ok && len(num[i]) == f.m && len(den[i]) == f.m
	}
	if !ok {
		for i := range n {
			errs[i] = f.Coefficients(values[i], num[i], den[i])
		}
		return
	}
	if f.lanes == nil {
		f.lanes = new(laneStore)
	}
	ls := f.lanes
	for l := range Lanes {
		ls.v[l] = values[min(l, n-1)] // unused lanes repeat a set
		ls.bad[l] = false
	}
	f.replayLanes(ls)
	for i := range n {
		if ls.bad[i] {
			f.last = 1
			errs[i] = f.gen.Coefficients(f.n, values[i], f.a, f.radius, num[i], den[i])
			continue
		}
		f.last = 0
		errs[i] = finish(&ls.rn[i], &ls.rd[i], f.m, &f.pw, num[i], den[i])
	}
	ls.v = [Lanes][]float64{}
}

// replayLanes is replay for every lane of ls, marking in ls.bad the lanes
// that must take the general path.
func (f *FixedInterpolator) replayLanes(ls *laneStore) {
	for i, e := range f.n.Elements {
		if e.Kind == Resistor {
			for l := range Lanes {
				ls.y[i][l] = 1 / ls.v[l][e.Value]
			}
		}
	}
	m := f.m
	for i := range f.pts {
		p := &f.pts[i]
		var h, det [Lanes]complex128
		if p.real {
			var hr, dr [Lanes]float64
			f.solveRealLanes(p, ls, &hr, &dr)
			for l := range Lanes {
				h[l], det[l] = complex(hr[l], 0), complex(dr[l], 0)
			}
		} else {
			f.solveComplexLanes(p, ls, &h, &det)
		}
		if p.row < 0 {
			continue
		}
		for l := range Lanes {
			pn := h[l] * det[l]
			ls.rn[l][p.row], ls.rd[l][p.row] = real(pn), real(det[l])
			if p.two {
				ls.rn[l][p.row+1], ls.rd[l][p.row+1] = imag(pn), imag(det[l])
			}
		}
	}
	v := f.vlu[:m*m]
	for l := range Lanes {
		rn, rd := &ls.rn[l], &ls.rd[l]
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
		for r := m - 1; r >= 0; r-- {
			x1, x2 := rn[r], rd[r]
			for j := r + 1; j < m; j++ {
				x1 -= v[r*m+j] * rn[j]
				x2 -= v[r*m+j] * rd[j]
			}
			rn[r] = x1 / v[r*m+r]
			rd[r] = x2 / v[r*m+r]
		}
		nzn, nzd := false, false
		for j := range m {
			nzn = nzn || rn[j] != 0
			nzd = nzd || rd[j] != 0
		}
		if !nzn || !nzd {
			ls.bad[l] = true
		}
	}
}

// solveRealLanes is solveReal for every lane.
func (f *FixedInterpolator) solveRealLanes(p *fixedPoint, ls *laneStore, x, det *[Lanes]float64) {
	m, b, inv, yv := &ls.mr, &ls.br, &ls.ir, &ls.yr
	s := real(p.s)
	for i, e := range f.n.Elements {
		switch e.Kind {
		case Resistor:
			yv[i] = ls.y[i]
		case Capacitor:
			for l := range Lanes {
				yv[i][l] = s * ls.v[l][e.Value]
			}
		}
	}
	invA := f.a.invDC() + s*f.a.invWt()
	yv[f.ny+srcOne] = splat(1)
	yv[f.ny+srcInvA] = splat(invA)
	r := invA * f.a.ROutOhm
	yv[f.ny+srcInvAR] = splat(r)
	for _, op := range f.stamp {
		v := yv[op.src]
		if op.neg {
			for l := range Lanes {
				v[l] = -v[l]
			}
		}
		d := &m[op.dst]
		if op.first {
			*d = v
		} else {
			for l := range Lanes {
				d[l] += v[l]
			}
		}
	}
	b[f.n.Nodes] = splat(1)
	el := &p.e
	dt := splat(1)
	bad := &ls.bad
	for c := range el.cols {
		col := &el.cols[c]
		cand := el.cand[col.cLo:col.cHi]
		pv := &m[col.piv]
		for l := range Lanes {
			best := math.Abs(pv[l])
			if !(best > 0) || math.IsInf(best, 0) {
				bad[l] = true
			}
			for i, idx := range cand {
				a := math.Abs(m[idx][l])
				if int32(i) < col.pos && !(a < best) || int32(i) > col.pos && !(a <= best) {
					bad[l] = true
				}
			}
		}
		var iv [Lanes]float64
		for l := range Lanes {
			if col.flip {
				dt[l] = -dt[l]
			}
			dt[l] *= pv[l]
			iv[l] = 1 / pv[l]
		}
		inv[c] = iv
		for _, row := range el.rows[col.rLo:col.rHi] {
			fp := &m[row.f]
			var fr [Lanes]float64
			for l := range Lanes {
				fr[l] = fp[l] * iv[l]
			}
			*fp = fr
			ops := el.ops[2*row.oLo : 2*row.oHi]
			nu := 2 * (row.oMi - row.oLo)
			for k := int32(0); k < nu; k += 2 {
				d, s := &m[ops[k]], &m[ops[k+1]]
				for l := range Lanes {
					d[l] -= fr[l] * s[l]
				}
			}
			for k := nu; k < int32(len(ops)); k += 2 {
				d, s := &m[ops[k]], &m[ops[k+1]]
				for l := range Lanes {
					d[l] = -(fr[l] * s[l])
				}
			}
			if col.bPiv >= 0 {
				d, s := &b[row.b], &b[col.bPiv]
				if row.bFill {
					for l := range Lanes {
						d[l] = -(fr[l] * s[l])
					}
				} else {
					for l := range Lanes {
						d[l] -= fr[l] * s[l]
					}
				}
			}
		}
	}
	for _, br := range el.back {
		var v [Lanes]float64
		if br.has {
			v = b[br.b]
		}
		t := el.terms[2*br.tLo : 2*br.tHi]
		for k := 0; k < len(t); k += 2 {
			mm, bb := &m[t[k]], &b[t[k+1]]
			if k == 0 && !br.has {
				for l := range Lanes {
					v[l] = -(mm[l] * bb[l])
				}
				continue
			}
			for l := range Lanes {
				v[l] -= mm[l] * bb[l]
			}
		}
		iv := &inv[br.col]
		d := &b[br.b]
		for l := range Lanes {
			d[l] = v[l] * iv[l]
		}
	}
	*x = [Lanes]float64{}
	if el.outB >= 0 {
		*x = b[el.outB]
	}
	var acc [Lanes]float64
	for _, i := range el.scanM {
		for l := range Lanes {
			acc[l] += m[i][l] * 0
		}
	}
	for _, i := range el.scanB {
		for l := range Lanes {
			acc[l] += b[i][l] * 0
		}
	}
	for c := range el.cols {
		for l := range Lanes {
			acc[l] += inv[c][l] * 0
		}
	}
	for l := range Lanes {
		if acc[l] != 0 || math.IsNaN(dt[l]) {
			bad[l] = true
		}
	}
	*det = dt
}

// solveComplexLanes is solveComplex for every lane.
func (f *FixedInterpolator) solveComplexLanes(p *fixedPoint, ls *laneStore, x, det *[Lanes]complex128) {
	m, b, inv, yv := &ls.mc, &ls.bc, &ls.ic, &ls.yc
	s := p.s
	for i, e := range f.n.Elements {
		switch e.Kind {
		case Resistor:
			for l := range Lanes {
				yv[i][l] = complex(ls.y[i][l], 0)
			}
		case Capacitor:
			for l := range Lanes {
				c := ls.v[l][e.Value]
				yv[i][l] = complex(real(s)*c, imag(s)*c)
			}
		}
	}
	invA := complex(f.a.invDC(), 0) + s*complex(f.a.invWt(), 0)
	r := invA * complex(f.a.ROutOhm, 0)
	yv[f.ny+srcOne] = splatC(1)
	yv[f.ny+srcInvA] = splatC(invA)
	yv[f.ny+srcInvAR] = splatC(r)
	for _, op := range f.stamp {
		v := yv[op.src]
		if op.neg {
			for l := range Lanes {
				v[l] = -v[l]
			}
		}
		d := &m[op.dst]
		if op.first {
			*d = v
		} else {
			for l := range Lanes {
				d[l] += v[l]
			}
		}
	}
	b[f.n.Nodes] = splatC(1)
	el := &p.e
	dt := splatC(1)
	bad := &ls.bad
	for c := range el.cols {
		col := &el.cols[c]
		cand := el.cand[col.cLo:col.cHi]
		pv := &m[col.piv]
		for l := range Lanes {
			best := l1(pv[l])
			if !(best > 0) || math.IsInf(best, 0) {
				bad[l] = true
			}
			for i, idx := range cand {
				a := l1(m[idx][l])
				if int32(i) < col.pos && !(a < best) || int32(i) > col.pos && !(a <= best) {
					bad[l] = true
				}
			}
		}
		var iv [Lanes]complex128
		for l := range Lanes {
			if col.flip {
				dt[l] = -dt[l]
			}
			dt[l] *= pv[l]
			iv[l] = recip(pv[l])
		}
		inv[c] = iv
		for _, row := range el.rows[col.rLo:col.rHi] {
			fp := &m[row.f]
			var fr [Lanes]complex128
			for l := range Lanes {
				fr[l] = fp[l] * iv[l]
			}
			*fp = fr
			ops := el.ops[2*row.oLo : 2*row.oHi]
			nu := 2 * (row.oMi - row.oLo)
			for k := int32(0); k < nu; k += 2 {
				d, s := &m[ops[k]], &m[ops[k+1]]
				for l := range Lanes {
					d[l] -= fr[l] * s[l]
				}
			}
			for k := nu; k < int32(len(ops)); k += 2 {
				d, s := &m[ops[k]], &m[ops[k+1]]
				for l := range Lanes {
					d[l] = -(fr[l] * s[l])
				}
			}
			if col.bPiv >= 0 {
				d, s := &b[row.b], &b[col.bPiv]
				if row.bFill {
					for l := range Lanes {
						d[l] = -(fr[l] * s[l])
					}
				} else {
					for l := range Lanes {
						d[l] -= fr[l] * s[l]
					}
				}
			}
		}
	}
	for _, br := range el.back {
		var v [Lanes]complex128
		if br.has {
			v = b[br.b]
		}
		t := el.terms[2*br.tLo : 2*br.tHi]
		for k := 0; k < len(t); k += 2 {
			mm, bb := &m[t[k]], &b[t[k+1]]
			if k == 0 && !br.has {
				for l := range Lanes {
					v[l] = -(mm[l] * bb[l])
				}
				continue
			}
			for l := range Lanes {
				v[l] -= mm[l] * bb[l]
			}
		}
		iv := &inv[br.col]
		d := &b[br.b]
		for l := range Lanes {
			d[l] = v[l] * iv[l]
		}
	}
	*x = [Lanes]complex128{}
	if el.outB >= 0 {
		*x = b[el.outB]
	}
	var acc [Lanes]float64
	for _, i := range el.scanM {
		for l := range Lanes {
			acc[l] += real(m[i][l])*0 + imag(m[i][l])*0
		}
	}
	for _, i := range el.scanB {
		for l := range Lanes {
			acc[l] += real(b[i][l])*0 + imag(b[i][l])*0
		}
	}
	for c := range el.cols {
		for l := range Lanes {
			acc[l] += real(inv[c][l])*0 + imag(inv[c][l])*0
		}
	}
	for l := range Lanes {
		if acc[l] != 0 || cmplxNaN(dt[l]) {
			bad[l] = true
		}
	}
	*det = dt
}

func splat(x float64) (v [Lanes]float64) {
	for l := range v {
		v[l] = x
	}
	return v
}

func splatC(x complex128) (v [Lanes]complex128) {
	for l := range v {
		v[l] = x
	}
	return v
}
