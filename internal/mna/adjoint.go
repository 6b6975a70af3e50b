package mna

// Adjoint fills y with the transfers to V(Out) of small sources inserted
// into n, with the input source at zero volts (the input driven by an ideal
// source and grounded for the small-signal noise of a circuit, say), at the
// complex frequency s. y must have length n.Dim():
//
//   - y[i], i < n.Nodes: V(Out) per ampere injected into node i+1 from
//     ground (a source between nodes a and b, flowing into b, gives
//     y[b−1] − y[a−1], ground's term zero);
//   - y[n.Nodes]: V(Out) per volt added to the input source;
//   - y[n.Nodes+1+k]: V(Out) per volt on the right-hand side of op-amp k's
//     equation (counted in element order), which is minus a voltage source
//     in series with its non-inverting input.
//
// With M the nodal matrix of Transfer (M·x = b), V(Out) = e_Outᵀ·M⁻¹·b =
// yᵀ·b with Mᵀ·y = e_Out: one solve of the transposed system gives the
// transfer of every source at once (the adjoint network; common practice
// of circuit simulators' noise analysis). Adjoint does not allocate; n must
// have passed Check for len(values) and values must be positive. The error
// is ErrSingular when the matrix is singular at s.
func (w *Workspace) Adjoint(n *Netlist, values []float64, a Amp, s complex128, y []complex128) error {
	d := w.stamp(n, values, a, s)
	if len(y) != d {
		panic("mna: Adjoint: y has the wrong length") // a caller's bug
	}
	m := w.m[:d*d]
	for i := range d {
		for j := i + 1; j < d; j++ {
			m[i*d+j], m[j*d+i] = m[j*d+i], m[i*d+j]
		}
	}
	clear(w.b[:d])
	w.b[n.Out-1] = 1
	if _, _, err := w.solveRec(d, 0, nil); err != nil {
		return err
	}
	copy(y, w.b[:d])
	for _, v := range y {
		if v != v || real(v)-real(v) != 0 || imag(v)-imag(v) != 0 {
			return ErrSingular // NaN or infinite
		}
	}
	return nil
}

// Solve fills x with every unknown of n driven by a unit input at the
// complex frequency s: the node voltages x[i] = V(i+1)/V(In), i <
// n.Nodes, then the input source's current and the op-amps' output
// currents. x must have length n.Dim(). It does not allocate; n must have
// passed Check for len(values) and values must be positive. The error is
// ErrSingular when the matrix is singular at s.
func (w *Workspace) Solve(n *Netlist, values []float64, a Amp, s complex128, x []complex128) error {
	d := w.stamp(n, values, a, s)
	if len(x) != d {
		panic("mna: Solve: x has the wrong length") // a caller's bug
	}
	if _, _, err := w.solveRec(d, 0, nil); err != nil {
		return err
	}
	copy(x, w.b[:d])
	for _, v := range x {
		if v != v || real(v)-real(v) != 0 || imag(v)-imag(v) != 0 {
			return ErrSingular // NaN or infinite
		}
	}
	return nil
}
