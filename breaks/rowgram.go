package breaks

// rowGram: the cross-products of a break regression per candidate in a
// time independent of T (the engine of ls1, ls2, lp and cmr*).
//
// Every regressor of these tests is a short combination of atoms (see
// ls.go): fixed atoms (the constant, the trend t and the data columns
// y_{t-1}, Δy_t, Δy_{t-i}), break atoms (steps 1(t > b) and ramps
// (t - b) 1(t > b) at candidate dates b) and pulses 1(t = p). Write the
// design over the window t = t0..T as X = X̄ + E, with X̄ the smooth part
// (fixed and break atoms) and E the pulses, which are non-zero in a few
// rows R only (at most (k+1) per break). Then
//
//	X'X = X̄'X̄ + Σ_{r∈R} (x_r x_r' - x̄_r x̄_r')
//
// and X̄'X̄ = W' G W with W the (sparse) atom weights and G the Gram of the
// atoms: fixed × fixed from a table built once per series for every window
// start t0 = 2..kmax+2, break × fixed from prefix sums of the data (O(1)
// each, lmXData.atomDot), break × break in closed form. The rows r ∈ R are
// evaluated directly. Per candidate the cost is O((number of columns)² +
// |R| × columns), nothing depends on T and nothing is allocated once the
// scratch has grown.

type rgTerm struct {
	a int // atom index: fixed atoms 0..nf-1, break atoms nf+i
	w float64
}

type rgPulse struct {
	r int
	w float64
}

// rowGram is the per-goroutine engine; setup once per series, load once
// per candidate, fillTo for every window and width.
type rowGram struct {
	d   lmXData
	nf  int       // fixed atoms: 0 constant, 1 trend, 2+j data column j
	t0s int       // number of tabulated window starts (t0 = 2..t0s+1)
	tbl []float64 // tbl[(t0-2)*nf*nf + i*nf + j]
	// ss[t] = Σ_{s<=t} dd_s², the scale of the exact-fit rule (the
	// dependent variable of the original regression, which may differ
	// from the one used here by a constant in the column space).
	ss []float64
	// rd[r*nd+j] is data column j at row r (row-major copy of d.col).
	rd []float64
	nd int

	// candidate
	brk  []lmAtom
	sm   [][]rgTerm
	fa   []int // fixed atom of a column that is exactly one fixed atom, else -1
	dep  int   // fixed atom of the dependent variable
	nc   int
	rows []int     // distinct pulse rows
	ev   []float64 // ev[q*nc+i]: pulse weight of column i in row rows[q]
	slot []int32   // slot[r] = q+1 while loaded (reset by the next load)
	xr   []float64 // xr[q*nc+i]: smooth part x̄ of column i in row rows[q]
	yr   []float64 // the dependent variable in row rows[q]
	nzo  []int     // columns with a pulse in row q: nzc[nzo[q]:nzo[q+1]]
	nzc  []int

	// scratch
	ga   []float64
	gab  []float64 // break atoms × break atoms
	use  []bool
	xb   []float64
	zero []float64
}

// fixedAtom returns the lmAtom of fixed atom f.
func (e *rowGram) fixedAtom(f int) lmAtom {
	switch f {
	case 0:
		return lmAtom{lmKStep, 0}
	case 1:
		return lmAtom{lmKRamp, 0}
	}
	return lmAtom{lmKData, f - 2}
}

// setup builds the data columns of y (already transformed as the caller
// needs) with kmax lags and the fixed-atom tables; scaleDep, when not nil,
// is the series whose squared first differences give the exact-fit scale
// (else y's).
func (e *rowGram) setup(y []float64, kmax int, scaleDep []float64) {
	e.d.build(y, kmax)
	T := len(y)
	nf := 2 + e.d.nc
	e.nf = nf
	e.t0s = kmax + 1
	e.tbl = lmGrow(e.tbl, e.t0s*nf*nf)
	for t0 := 2; t0 <= kmax+2; t0++ {
		tb := e.tbl[(t0-2)*nf*nf : (t0-1)*nf*nf]
		for i := 0; i < nf; i++ {
			for j := 0; j <= i; j++ {
				v := e.d.atomDot(e.fixedAtom(i), e.fixedAtom(j), t0)
				tb[i*nf+j], tb[j*nf+i] = v, v
			}
		}
	}
	nd := e.d.nc
	e.nd = nd
	e.rd = searchGrow(e.rd, (T+1)*nd)
	for j := 0; j < nd; j++ {
		c := e.d.col[j]
		for r := 0; r <= T; r++ {
			e.rd[r*nd+j] = c[r]
		}
	}
	if scaleDep == nil {
		scaleDep = y
	}
	e.ss = lmGrow(e.ss, T+1)
	for t := 2; t <= T; t++ {
		v := scaleDep[t-1] - scaleDep[t-2]
		e.ss[t] = e.ss[t-1] + v*v
	}
}

// atomIndex returns the index of atom a, registering a break atom.
func (e *rowGram) atomIndex(a lmAtom) int {
	switch {
	case a.kind == lmKData:
		return 2 + a.v
	case a.kind == lmKStep && a.v == 0:
		return 0
	case a.kind == lmKRamp && a.v == 0:
		return 1
	}
	for i, b := range e.brk {
		if b == a {
			return e.nf + i
		}
	}
	e.brk = append(e.brk, a)
	return e.nf + len(e.brk) - 1
}

// load converts the columns of a candidate (and the dependent variable, a
// single data atom) into smooth terms and a row-major table of pulses.
func (e *rowGram) load(cols []lmColumn, dep lmColumn) {
	e.begin(len(cols))
	for i, c := range cols {
		for _, t := range c {
			if t.a.kind == lmKPulse {
				e.pulse(i, t.a.v, t.c)
			} else {
				e.smooth(i, t.a, t.c)
			}
		}
	}
	if len(dep) != 1 || dep[0].a.kind != lmKData || dep[0].c != 1 {
		panic("breaks: rowGram dependent variable must be one data column")
	}
	e.finish(dep[0].a.v)
}

// begin starts loading a candidate with n columns; smooth and pulse add
// terms to column i, finish closes the candidate with the dependent
// variable data column dep.
func (e *rowGram) begin(n int) {
	e.nc = n
	e.brk = e.brk[:0]
	if cap(e.sm) < n {
		e.sm = append(e.sm[:cap(e.sm)], make([][]rgTerm, n-cap(e.sm))...)
	}
	e.sm = e.sm[:n]
	for i := range e.sm {
		e.sm[i] = e.sm[i][:0]
	}
	if cap(e.fa) < n {
		e.fa = make([]int, n)
	}
	e.fa = e.fa[:n]
	if len(e.slot) < e.d.T+2 {
		e.slot = make([]int32, e.d.T+2)
	}
	for _, r := range e.rows {
		e.slot[r] = 0
	}
	e.rows = e.rows[:0]
	e.ev = e.ev[:0]
}

func (e *rowGram) smooth(i int, a lmAtom, w float64) {
	e.sm[i] = append(e.sm[i], rgTerm{e.atomIndex(a), w})
}

func (e *rowGram) pulse(i, r int, w float64) {
	if r < 1 || r > e.d.T {
		return
	}
	n := e.nc
	q := int(e.slot[r]) - 1
	if q < 0 {
		q = len(e.rows)
		e.rows = append(e.rows, r)
		e.slot[r] = int32(q + 1)
		e.ev = append(e.ev, e.zeros(n)...)
	}
	e.ev[q*n+i] += w
}

// zeros returns n zeros (scratch, not to be modified).
func (e *rowGram) zeros(n int) []float64 {
	if len(e.zero) < n {
		e.zero = make([]float64, n)
	}
	return e.zero[:n]
}

func (e *rowGram) finish(dep int) {
	n := e.nc
	for i, sm := range e.sm {
		e.fa[i] = -1
		if len(sm) == 1 && sm[0].w == 1 && sm[0].a < e.nf {
			e.fa[i] = sm[0].a
		}
	}
	e.dep = 2 + dep
	// Smooth parts and pulse columns of the pulse rows.
	nr := len(e.rows)
	e.xr = searchGrow(e.xr, nr*n)
	e.yr = searchGrow(e.yr, nr)
	e.nzo = append(e.nzo[:0], 0)
	e.nzc = e.nzc[:0]
	for q, r := range e.rows {
		xb := e.xr[q*n : (q+1)*n]
		evq := e.ev[q*n : (q+1)*n]
		rdr := e.rd[r*e.nd : (r+1)*e.nd]
		for i, f := range e.fa[:n] {
			switch {
			case f >= 2:
				xb[i] = rdr[f-2]
			case f == 0:
				xb[i] = 1
			default:
				x := 0.0
				for _, t := range e.sm[i] {
					x += t.w * e.atomAt(t.a, r)
				}
				xb[i] = x
			}
			if evq[i] != 0 {
				e.nzc = append(e.nzc, i)
			}
		}
		e.nzo = append(e.nzo, len(e.nzc))
		e.yr[q] = e.d.col[e.dep-2][r]
	}
}

// atomAt is the value of atom index a at row r.
func (e *rowGram) atomAt(a, r int) float64 {
	switch {
	case a == 0:
		return 1
	case a == 1:
		return float64(r)
	case a < e.nf:
		return e.d.col[a-2][r]
	}
	b := e.brk[a-e.nf]
	if r <= b.v {
		return 0
	}
	if b.kind == lmKStep {
		return 1
	}
	return float64(r - b.v)
}

// dot is the cross-product of atoms a and b over the current window.
func (e *rowGram) dot(tb []float64, na, a, b int) float64 {
	nf := e.nf
	if a < nf && b < nf {
		return tb[a*nf+b]
	}
	if a < b {
		a, b = b, a
	}
	if b < nf {
		return e.ga[(a-nf)*nf+b]
	}
	return e.gab[(a-nf)*(na-nf)+b-nf]
}

// fillTo fills g with the cross-products of the leading n loaded columns
// and the dependent variable over t = t0..T (t0 <= kmax+2).
func (e *rowGram) fillTo(g *lmGram, n, t0 int) {
	nf, T := e.nf, e.d.T
	if t0 < 2 || t0-2 >= e.t0s {
		panic("breaks: rowGram window start outside the table")
	}
	nb := len(e.brk)
	na := nf + nb
	tb := e.tbl[(t0-2)*nf*nf : (t0-1)*nf*nf]
	// Break atoms × the fixed atoms in use, and × each other.
	if nb > 0 {
		if cap(e.use) < nf {
			e.use = make([]bool, nf)
		}
		use := e.use[:nf]
		clear(use)
		use[e.dep] = true
		for i := 0; i < n; i++ {
			if e.fa[i] >= 0 {
				use[e.fa[i]] = true
				continue
			}
			for _, t := range e.sm[i] {
				if t.a < nf {
					use[t.a] = true
				}
			}
		}
		e.ga = searchGrow(e.ga, nb*nf)
		e.gab = searchGrow(e.gab, nb*nb)
		for i, bi := range e.brk {
			row := e.ga[i*nf : (i+1)*nf]
			for f, u := range use {
				if u {
					row[f] = e.d.atomDot(bi, e.fixedAtom(f), t0)
				}
			}
			for j := 0; j <= i; j++ {
				v := e.d.atomDot(bi, e.brk[j], t0)
				e.gab[i*nb+j], e.gab[j*nb+i] = v, v
			}
		}
	}
	g.n = n
	g.a = searchGrow(g.a, n*n) // every entry of the lower triangle is set below
	g.b = searchGrow(g.b, n)
	dep := e.dep
	for i := 0; i < n; i++ {
		fi := e.fa[i]
		si := e.sm[i]
		for j := 0; j <= i; j++ {
			if fj := e.fa[j]; fi >= 0 && fj >= 0 {
				g.a[i*n+j] = tb[fi*nf+fj]
				continue
			}
			s := 0.0
			for _, p := range si {
				for _, q := range e.sm[j] {
					s += p.w * q.w * e.dot(tb, na, p.a, q.a)
				}
			}
			g.a[i*n+j] = s
		}
		if fi >= 0 {
			g.b[i] = tb[fi*nf+dep]
			continue
		}
		s := 0.0
		for _, p := range si {
			s += p.w * e.dot(tb, na, p.a, dep)
		}
		g.b[i] = s
	}
	g.yy = tb[dep*nf+dep]
	g.scale = e.ss[T] - e.ss[t0-1]
	g.obs = T - t0 + 1
	if len(e.rows) == 0 {
		return
	}
	// Pulse rows: x x' - x̄ x̄' = e x' + x̄ e' (lower triangle).
	nc := e.nc
	for q, r := range e.rows {
		if r < t0 {
			continue
		}
		ev := e.ev[q*nc : q*nc+n]
		xb := e.xr[q*nc : q*nc+n]
		nz := e.nzc[e.nzo[q]:e.nzo[q+1]]
		yr := e.yr[q]
		for _, i := range nz {
			if i >= n {
				break
			}
			ei, xbi := ev[i], xb[i]
			row := g.a[i*n : i*n+i+1]
			ej := ev[:len(row)]
			xj := xb[:len(row)]
			for j, v := range row {
				row[j] = v + ei*(xj[j]+ej[j]) + xbi*ej[j]
			}
			g.b[i] += ei * yr
		}
		for _, j := range nz {
			if j >= n {
				break
			}
			ej := ev[j]
			for i := j + 1; i < n; i++ {
				if ev[i] == 0 {
					g.a[i*n+j] += xb[i] * ej
				}
			}
		}
	}
}

// extend turns g, filled by fillTo for the leading g.n columns over
// t = t0'..T, into the cross-products of the leading w <= g.n columns over
// t = t0..T (t0 <= t0') by adding the rows t0..t0'-1: the final regression
// of a lag search reuses the selection's cross-products.
func (e *rowGram) extend(g *lmGram, w, t0 int) {
	T := e.d.T
	from := T - g.obs + 1
	n := g.n
	if w > n || t0 > from {
		panic("breaks: rowGram.extend needs a wider, later window")
	}
	for i := 0; i < w; i++ {
		copy(g.a[i*w:i*w+i+1], g.a[i*n:i*n+i+1])
	}
	g.n = w
	g.a = g.a[:w*w]
	g.b = g.b[:w]
	e.xb = searchGrow(e.xb, w)
	xb := e.xb
	for r := t0; r < from; r++ {
		yr := e.rowValues(r, w, xb)
		for i := 0; i < w; i++ {
			xi := xb[i]
			row := g.a[i*w : i*w+i+1]
			for j, v := range row {
				row[j] = v + xi*xb[j]
			}
			g.b[i] += xi * yr
		}
		g.yy += yr * yr
	}
	g.scale = e.ss[T] - e.ss[t0-1]
	g.obs = T - t0 + 1
}

// rowValues writes the values of the leading n loaded columns at row r
// (smooth parts and pulses) into dst and returns the dependent variable at r.
func (e *rowGram) rowValues(r, n int, dst []float64) float64 {
	rdr := e.rd[r*e.nd : (r+1)*e.nd]
	q := int(e.slot[r]) - 1
	for i, f := range e.fa[:n] {
		var x float64
		switch {
		case f >= 2:
			x = rdr[f-2]
		case f == 0:
			x = 1
		default:
			for _, t := range e.sm[i] {
				x += t.w * e.atomAt(t.a, r)
			}
		}
		if q >= 0 {
			x += e.ev[q*e.nc+i]
		}
		dst[i] = x
	}
	return rdr[e.dep-2]
}
