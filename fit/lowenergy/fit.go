package lowenergy

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/golang/geo/r3"
	"gonum.org/v1/gonum/diff/fd"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/optimize"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/phys"
)

// minHits is the smallest number of selected hits (and distinct sensors)
// a vertex fit accepts: one more than its four parameters.
const minHits = 5

// seedKeep is the number of candidates each seed-grid level keeps.
const seedKeep = 4

// selHit is a selected hit: the sensor position over the group velocity
// (ns), the hit time (ns) and the sensor index.
type selHit struct {
	s      r3.Vector
	t      float64
	sensor int32
}

type candidate struct {
	q      r3.Vector // position / vg (ns)
	t0     float64
	score  float64
	centre float64 // centre of the densest residual window (ns)
}

// scratch is the per-call working space of Fit.
type scratch struct {
	sorted  []pmt.Hit
	sel     []selHit
	resid   []float64
	hist    []int32
	hitFlag []bool
	prompt  []int32
	units   []r3.Vector
	cands   [seedKeep]candidate
	next    [seedKeep]candidate
	evals   int
	eps     float64
	logRes  logTable
	logDir  logTable
}

func newScratch(nSensors int) *scratch {
	return &scratch{hitFlag: make([]bool, nSensors)}
}

// Fit reconstructs the vertex, time, direction and energy of one event
// from its hits. Hits that fail fit.CheckHits (a sensor index outside the
// detector, a non-finite time, a charge not finite and positive, two hits
// of one sensor within its integration gate) make Fit return an error and
// a Result with Status fit.BadInput and the error as Reason. Hits on dead
// sensors are left out and counted (Result.DeadHits). Events that cannot
// be fitted (no hits, too few hits or sensors) return a Result with that
// Status and the reason, and a nil error. The hits are not modified.
func (f *Fitter) Fit(hits []pmt.Hit) (Result, error) {
	if err := f.checkHits(hits); err != nil {
		return Result{Hits: len(hits), Status: fit.BadInput, Reason: err.Error()}, err
	}
	res := Result{Hits: len(hits)}
	if len(hits) == 0 {
		return failed(res, fit.NoHits, "the event has no hits"), nil
	}
	sc := f.pool.Get().(*scratch)
	defer f.pool.Put(sc)
	sc.evals = 0
	res.DeadHits = f.selectHits(sc, hits)
	if res.DeadHits == len(hits) {
		return failed(res, fit.NoHits, fmt.Sprintf("all %d hits are on dead sensors", len(hits))), nil
	}
	res.Selected = len(sc.sel)
	if p, ok := f.darkOnly(sc); ok {
		return failed(res, fit.NoEvent, fmt.Sprintf("%d hits in the selection window are consistent with dark noise alone (probability %.2g of as many in some window of the event's hits)", len(sc.sel), p)), nil
	}
	if len(sc.sel) < minHits {
		return failed(res, fit.TooFewHits, fmt.Sprintf("%d hits in the selection window, need at least %d", len(sc.sel), minHits)), nil
	}
	distinct := 0
	for _, h := range sc.sel {
		if !sc.hitFlag[h.sensor] {
			sc.hitFlag[h.sensor] = true
			distinct++
		}
	}
	f.clearFlags(sc)
	if distinct < minHits {
		return failed(res, fit.TooFewSensors, fmt.Sprintf("selected hits on %d distinct sensors, need at least %d", distinct, minHits)), nil
	}
	f.setDark(sc)
	res.DarkFraction = sc.eps

	best := f.seed(sc)
	x, status, reason := f.maximizeVertex(sc, best)
	// The hits of a short track lie on a ring, and every point on the
	// ring's axis sees them at nearly equal distances: the likelihood has
	// a long valley along the axis. Scan it and restart from the best point.
	if c, ok := f.scanAxis(sc, x); ok {
		if y, st, why := f.maximizeVertex(sc, c); y.score < x.score {
			x, status, reason = y, st, why
		}
	}
	res.Ambiguity = f.ambiguity(sc, x)
	// Uncertainties from the curvature of -log L at the maximum. Without
	// a positive definite curvature the point is no proper maximum.
	cov, ok := f.vertexCovariance(sc, x)
	if !ok && status == fit.Converged {
		status, reason = fit.NotConverged, "the curvature of the time likelihood is not positive definite at the maximum"
	}
	f.promptHits(sc, x)
	dir, angleErr, dirOK, dirLogL := f.fitDirection(sc, x)
	tr := &res.Track
	tr.Vertex = x.q.Mul(f.vg)
	tr.Time = x.t0
	tr.Dir = dir
	res.Errors.Angle = angleErr
	res.LogLikelihood = -f.nll(sc, x.q, x.t0)
	if ok {
		scale := [4]float64{f.vg, f.vg, f.vg, 1}
		for i := range 4 {
			for j := range 4 {
				res.Cov[i][j] = cov[i][j] * scale[i] * scale[j]
			}
		}
		res.Errors.Vertex = r3.Vector{X: math.Sqrt(res.Cov[0][0]), Y: math.Sqrt(res.Cov[1][1]), Z: math.Sqrt(res.Cov[2][2])}
		res.Errors.Time = math.Sqrt(res.Cov[3][3])
	}
	meanLog, varLog, fisher := f.res.stats(sc.eps)
	nSel := float64(len(sc.sel))
	res.Goodness = (res.LogLikelihood - nSel*meanLog) / math.Sqrt(nSel*varLog)
	res.VertexCRB = f.cramerRao(sc, x, fisher)

	res.DirLogLikelihood = dirLogL
	if np := float64(len(sc.prompt)); np > 0 {
		m, v := dirMoments(&sc.logDir)
		res.DirGoodness = (dirLogL - np*m) / math.Sqrt(np*v)
	}
	res.Prompt = len(sc.prompt)
	res.Neff = f.effectiveHits(sc, x)
	var cp CalibrationPoint
	tr.Ekin, res.Errors.Ekin, res.Shift, cp = f.energyFromNeff(res.Neff)
	// The fitted point is the light-weighted centre of the track; move it
	// back to the track start by the calibrated shift at this energy.
	tr.Vertex = tr.Vertex.Sub(tr.Dir.Mul(res.Shift))
	tr.Time -= res.Shift / phys.SpeedOfLight
	res.AngleStat = angleErr
	if ok {
		res.Errors.Angle, res.Errors.Vertex, res.Errors.Time = f.shared(&res, cp)
	}
	res.Evaluations = sc.evals

	if status == fit.Converged && !finiteResult(&res) {
		status, reason = fit.NotConverged, "a fitted value or uncertainty is not finite"
	}
	if lo, hi := f.EkinRange(); tr.Ekin < lo || tr.Ekin > hi {
		res.EkinOutside = true
	}
	res.Suspect = res.Ambiguity < suspectAmbiguity || !(res.Errors.Vertex.Norm() <= suspectVertexError) ||
		(res.Ambiguity < narrowAmbiguity && res.DirGoodness > narrowDirGoodness)
	res.ErrorsValid = ok && dirOK
	if status == fit.Converged && !dirOK {
		reason = "the curvature of the direction likelihood is not positive definite (too few prompt hits or a flat maximum): the angle errors are pi"
	}
	if status == fit.Converged && res.EkinOutside {
		lo, hi := f.EkinRange()
		reason = strings.TrimPrefix(reason+"; ", "; ") + fmt.Sprintf("the energy %.4g MeV is outside the calibration [%g, %g] MeV: extrapolated, with the distance to the range in its error", tr.Ekin, lo, hi)
	}
	res.Status, res.Reason = status, reason
	return res, nil
}

func failed(r Result, s fit.Status, reason string) Result {
	r.Status, r.Reason = s, reason
	return r
}

func finiteResult(r *Result) bool {
	t, e := &r.Track, &r.Errors
	vals := []float64{
		t.Vertex.X, t.Vertex.Y, t.Vertex.Z, t.Time, t.Dir.X, t.Dir.Y, t.Dir.Z, t.Ekin,
		e.Vertex.X, e.Vertex.Y, e.Vertex.Z, e.Time, e.Angle[0], e.Angle[1], e.Ekin,
		r.Neff, r.LogLikelihood, r.DirLogLikelihood, r.Goodness, r.VertexCRB.X, r.VertexCRB.Y, r.VertexCRB.Z,
	}
	for _, v := range vals {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}

func (f *Fitter) clearFlags(sc *scratch) {
	for _, h := range sc.sel {
		sc.hitFlag[h.sensor] = false
	}
}

// selectHits keeps the hits of live sensors in the window of length
// selWindow that holds the most of them: all signal hits of an event
// inside the tank fall within it, and dark hits outside it are dropped.
// It returns the number of hits on dead sensors.
func (f *Fitter) selectHits(sc *scratch, hits []pmt.Hit) (dead int) {
	sc.sorted = sc.sorted[:0]
	for _, h := range hits {
		if f.dead[h.Sensor] {
			dead++
			continue
		}
		sc.sorted = append(sc.sorted, h)
	}
	slices.SortFunc(sc.sorted, func(a, b pmt.Hit) int { return cmp.Compare(a.Time, b.Time) })
	bestStart, bestCount := 0, 0
	j := 0
	for i := range sc.sorted {
		for j < len(sc.sorted) && sc.sorted[j].Time < sc.sorted[i].Time+f.selWindow {
			j++
		}
		if j-i > bestCount {
			bestStart, bestCount = i, j-i
		}
	}
	sc.sel = sc.sel[:0]
	for _, h := range sc.sorted[bestStart : bestStart+bestCount] {
		sc.sel = append(sc.sel, selHit{s: f.scaled[h.Sensor], t: h.Time, sensor: int32(h.Sensor)})
	}
	return dead
}

// nll is -log L of the time residuals at the scaled vertex q and time t0.
func (f *Fitter) nll(sc *scratch, q r3.Vector, t0 float64) float64 {
	sc.evals++
	sum := 0.0
	for _, h := range sc.sel {
		r := h.t - t0 - h.s.Sub(q).Norm()
		lf, _ := sc.logRes.at(r)
		sum -= lf
	}
	return sum
}

// nllGrad stores the gradient of nll in g (q then t0) and returns nll.
func (f *Fitter) nllGrad(sc *scratch, q r3.Vector, t0 float64, g []float64) float64 {
	sc.evals++
	sum := 0.0
	var gq r3.Vector
	gt := 0.0
	for _, h := range sc.sel {
		d := h.s.Sub(q)
		dist := d.Norm()
		r := h.t - t0 - dist
		lf, dlf := sc.logRes.at(r)
		sum -= lf
		// dr/dq = (s-q)/|s-q|, dr/dt0 = -1.
		if dist > 0 {
			gq = gq.Sub(d.Mul(dlf / dist))
		}
		gt += dlf
	}
	g[0], g[1], g[2], g[3] = gq.X, gq.Y, gq.Z, gt
	return sum
}

// score fills sc.resid with the residuals at scaled vertex q and returns
// the largest number of residuals inside a window of about width ns, with
// the window centre.
func (f *Fitter) score(sc *scratch, q r3.Vector, width float64) (score, centre float64) {
	sc.resid = sc.resid[:0]
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, h := range sc.sel {
		r := h.t - h.s.Sub(q).Norm()
		sc.resid = append(sc.resid, r)
		if r < lo {
			lo = r
		}
		if r > hi {
			hi = r
		}
	}
	bw := width / 2
	nb := int((hi-lo)/bw) + 2
	if nb > 4096 {
		nb = 4096
		bw = (hi - lo) / float64(nb-2)
	}
	if cap(sc.hist) < nb {
		sc.hist = make([]int32, nb)
	}
	sc.hist = sc.hist[:nb]
	clear(sc.hist)
	for _, r := range sc.resid {
		sc.hist[int((r-lo)/bw)]++
	}
	best, bj := int32(-1), 0
	for j := 0; j+1 < nb; j++ {
		if c := sc.hist[j] + sc.hist[j+1]; c > best {
			best, bj = c, j
		}
	}
	side := int32(0)
	if bj > 0 {
		side += sc.hist[bj-1]
	}
	if bj+2 < nb {
		side += sc.hist[bj+2]
	}
	return float64(best) + 1e-3*float64(side), lo + float64(bj+1)*bw
}

// keep inserts c into the descending top list if it scores high enough;
// a candidate within minDist (ns) of a listed one replaces it only if it
// scores higher, so the list holds distinct regions.
func keep(top *[seedKeep]candidate, filled *int, c candidate, minDist float64) {
	for i := 0; i < *filled; i++ {
		if top[i].q.Sub(c.q).Norm() < minDist {
			if c.score <= top[i].score {
				return
			}
			top[i] = c
			for ; i > 0 && top[i].score > top[i-1].score; i-- {
				top[i], top[i-1] = top[i-1], top[i]
			}
			return
		}
	}
	if *filled < seedKeep {
		top[*filled] = c
		*filled++
	} else if c.score <= top[seedKeep-1].score {
		return
	} else {
		top[seedKeep-1] = c
	}
	for i := *filled - 1; i > 0 && top[i].score > top[i-1].score; i-- {
		top[i], top[i-1] = top[i-1], top[i]
	}
}

// seed finds a starting point without any prior: a coarse grid over the
// volume scored by the densest window of residuals, refined by halving
// the spacing around the best candidates, then the time profiled with the
// full likelihood.
func (f *Fitter) seed(sc *scratch) candidate {
	s := f.coarseSpacing
	width := func(s float64) float64 { return math.Sqrt(3)*s/f.vg + 3*f.sigmaT }
	filled := 0
	w := width(s)
	for _, p := range f.coarse {
		q := p.Mul(1 / f.vg)
		score, c := f.score(sc, q, w)
		keep(&sc.cands, &filled, candidate{q: q, score: score, centre: c}, 1.5*s/f.vg)
	}
	tank := f.det.Tank()
	rMax, zMax := tank.SensorRadius(), tank.SensorHalfHeight()
	for s > 25 {
		s /= 2
		w = width(s)
		prev := sc.cands
		nPrev := filled
		filled = 0
		for k := range nPrev {
			base := prev[k].q.Mul(f.vg)
			for iz := -1; iz <= 1; iz++ {
				for iy := -1; iy <= 1; iy++ {
					for ix := -1; ix <= 1; ix++ {
						p := base.Add(r3.Vector{X: float64(ix) * s, Y: float64(iy) * s, Z: float64(iz) * s})
						if math.Hypot(p.X, p.Y) > rMax || math.Abs(p.Z) > zMax {
							continue
						}
						q := p.Mul(1 / f.vg)
						score, c := f.score(sc, q, w)
						keep(&sc.next, &filled, candidate{q: q, score: score, centre: c}, 1.5*s/f.vg)
					}
				}
			}
		}
		sc.cands = sc.next
	}
	// Profile the time of each candidate with the likelihood.
	best := candidate{score: math.Inf(1)}
	for k := range filled {
		c := sc.cands[k]
		for t := c.centre - w; t <= c.centre+w; t += 0.5 {
			if v := f.nll(sc, c.q, t); v < best.score {
				best = candidate{q: c.q, t0: t, score: v}
			}
		}
	}
	return best
}

// maximizeVertex runs BFGS with the analytic gradient from the seed, and
// Nelder-Mead from the best point if BFGS fails.
func (f *Fitter) maximizeVertex(sc *scratch, start candidate) (candidate, fit.Status, string) {
	p := optimize.Problem{
		Func: func(x []float64) float64 {
			return f.nll(sc, r3.Vector{X: x[0], Y: x[1], Z: x[2]}, x[3])
		},
		Grad: func(g, x []float64) {
			f.nllGrad(sc, r3.Vector{X: x[0], Y: x[1], Z: x[2]}, x[3], g)
		},
	}
	x0 := []float64{start.q.X, start.q.Y, start.q.Z, start.t0}
	settings := &optimize.Settings{
		MajorIterations:   f.maxIter,
		Runtime:           f.maxDur,
		GradientThreshold: 1e-3,
		Converger:         &optimize.FunctionConverge{Absolute: 1e-7, Iterations: 10},
	}
	r, err := optimize.Minimize(p, x0, settings, &optimize.BFGS{})
	bestX, bestF := x0, start.score
	if r != nil && r.F < bestF && finiteSlice(r.X) {
		bestX, bestF = r.X, r.F
	}
	if err == nil && r != nil && (r.Status == optimize.GradientThreshold || r.Status == optimize.FunctionConvergence) {
		return candidate{q: r3.Vector{X: bestX[0], Y: bestX[1], Z: bestX[2]}, t0: bestX[3], score: bestF}, fit.Converged, ""
	}
	nm := &optimize.NelderMead{SimplexSize: 0.5}
	settings = &optimize.Settings{
		MajorIterations: 4 * f.maxIter,
		Runtime:         f.maxDur,
		Converger:       &optimize.FunctionConverge{Absolute: 1e-6, Iterations: 40},
	}
	r2, err2 := optimize.Minimize(optimize.Problem{Func: p.Func}, bestX, settings, nm)
	if r2 != nil && r2.F <= bestF && finiteSlice(r2.X) {
		bestX, bestF = r2.X, r2.F
	}
	c := candidate{q: r3.Vector{X: bestX[0], Y: bestX[1], Z: bestX[2]}, t0: bestX[3], score: bestF}
	if err2 == nil && r2 != nil && r2.Status == optimize.FunctionConvergence {
		return c, fit.Converged, ""
	}
	reason := "the vertex optimizer did not converge"
	if err2 != nil {
		reason += ": " + err2.Error()
	} else if r2 != nil {
		reason += ": " + r2.Status.String()
	}
	return c, fit.NotConverged, reason
}

func finiteSlice(x []float64) bool {
	for _, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}

// hessianStep (ns) is the finite-difference step of the curvature: a few
// steps of the residual grid, far below the timing width.
const hessianStep = 0.25

// vertexCovariance inverts the curvature of -log L at x (scaled units),
// computed by central differences of the analytic gradient.
func (f *Fitter) vertexCovariance(sc *scratch, x candidate) ([4][4]float64, bool) {
	var out [4][4]float64
	jac := mat.NewDense(4, 4, nil)
	grad := func(g, p []float64) {
		f.nllGrad(sc, r3.Vector{X: p[0], Y: p[1], Z: p[2]}, p[3], g)
	}
	fd.Jacobian(jac, grad, []float64{x.q.X, x.q.Y, x.q.Z, x.t0}, &fd.JacobianSettings{Formula: fd.Central, Step: hessianStep})
	ok := invertSym(jac, [][]float64{out[0][:], out[1][:], out[2][:], out[3][:]})
	return out, ok
}

// invertSym symmetrizes the square matrix m and inverts it through a
// Cholesky factorization into out (the leading n x n block); false if it
// is not positive definite.
func invertSym(m *mat.Dense, out [][]float64) bool {
	n, _ := m.Dims()
	sym := mat.NewSymDense(n, nil)
	for i := range n {
		for j := i; j < n; j++ {
			sym.SetSym(i, j, 0.5*(m.At(i, j)+m.At(j, i)))
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(sym) {
		return false
	}
	var inv mat.SymDense
	if err := ch.InverseTo(&inv); err != nil {
		return false
	}
	for i := range n {
		if !(inv.At(i, i) > 0) {
			return false
		}
		for j := range n {
			out[i][j] = inv.At(i, j)
		}
	}
	return true
}

// cramerRao returns the per-coordinate Cramer-Rao bounds (cm) of the
// vertex for the selected hits at x: the Fisher information of the
// residual density's location, I_f, times sum_i g_i g_i^T with g_i the
// gradient of residual i in (q, t0), inverted.
func (f *Fitter) cramerRao(sc *scratch, x candidate, fisher float64) r3.Vector {
	info := mat.NewDense(4, 4, nil)
	var g [4]float64
	for _, h := range sc.sel {
		d := h.s.Sub(x.q)
		dist := d.Norm()
		if dist == 0 {
			continue
		}
		g = [4]float64{-d.X / dist, -d.Y / dist, -d.Z / dist, -1}
		for i := range 4 {
			for j := range 4 {
				info.Set(i, j, info.At(i, j)+fisher*g[i]*g[j])
			}
		}
	}
	var cov [4][4]float64
	if !invertSym(info, [][]float64{cov[0][:], cov[1][:], cov[2][:], cov[3][:]}) {
		return r3.Vector{X: math.Inf(1), Y: math.Inf(1), Z: math.Inf(1)}
	}
	return r3.Vector{X: math.Sqrt(cov[0][0]), Y: math.Sqrt(cov[1][1]), Z: math.Sqrt(cov[2][2])}.Mul(f.vg)
}

// promptHits collects the selected hits whose residual at x is inside the
// prompt window.
func (f *Fitter) promptHits(sc *scratch, x candidate) {
	sc.prompt = sc.prompt[:0]
	for i, h := range sc.sel {
		r := h.t - x.t0 - h.s.Sub(x.q).Norm()
		if r >= f.promptLo && r <= f.promptHi {
			sc.prompt = append(sc.prompt, int32(i))
		}
	}
}

// TimeLogLikelihood returns the time log-likelihood of the hits at vertex
// v (cm) and time t0 (ns), with the hit selection and dark fraction Fit
// uses (hits on dead sensors left out): the quantity Fit maximizes. It
// returns an error for hits that fail fit.CheckHits or fewer than five
// selected hits.
func (f *Fitter) TimeLogLikelihood(hits []pmt.Hit, v r3.Vector, t0 float64) (float64, error) {
	if err := f.checkHits(hits); err != nil {
		return 0, err
	}
	sc := f.pool.Get().(*scratch)
	defer f.pool.Put(sc)
	f.selectHits(sc, hits)
	if len(sc.sel) < minHits {
		return 0, fmt.Errorf("lowenergy: %d hits in the selection window, need at least %d", len(sc.sel), minHits)
	}
	f.setDark(sc)
	return -f.nll(sc, v.Mul(1/f.vg), t0), nil
}

// darkFraction is the expected fraction of dark hits among n selected.
func (f *Fitter) darkFraction(n int) float64 {
	return math.Min(math.Max(f.darkPerNs*f.selWindow/float64(n), minDarkFraction), 0.95)
}

// checkHits applies fit.CheckHits with the sensor's integration gate.
func (f *Fitter) checkHits(hits []pmt.Hit) error {
	if err := fit.CheckHits(hits, len(f.pos), f.sensor.IntegrationWindow); err != nil {
		return fmt.Errorf("lowenergy: %w", err)
	}
	return nil
}

// axisStep (cm) is the spacing of the axis scan.
const axisStep = 50

// scanAxis scans the line through x along the mean direction of the
// prompt hits, the ring axis, over the sensor cylinder, with the time
// profiled around the densest residual window, and returns the best point
// if it is better than x.
func (f *Fitter) scanAxis(sc *scratch, x candidate) (candidate, bool) {
	f.promptHits(sc, x)
	var axis r3.Vector
	for _, i := range sc.prompt {
		axis = axis.Add(sc.sel[i].s.Sub(x.q).Normalize())
	}
	if len(sc.prompt) < 2 || axis.Norm() == 0 {
		return candidate{}, false
	}
	axis = axis.Normalize()
	tank := f.det.Tank()
	rMax, zMax := tank.SensorRadius(), tank.SensorHalfHeight()
	reach := 2 * math.Hypot(rMax, zMax)
	v0 := x.q.Mul(f.vg)
	best := x
	found := false
	w := 3 * f.sigmaT
	for a := -reach; a <= reach; a += axisStep {
		p := v0.Add(axis.Mul(a))
		if math.Hypot(p.X, p.Y) > rMax || math.Abs(p.Z) > zMax {
			continue
		}
		q := p.Mul(1 / f.vg)
		_, centre := f.score(sc, q, w)
		for t := centre - 4; t <= centre+4; t += 2 {
			if v := f.nll(sc, q, t); v < best.score {
				best, found = candidate{q: q, t0: t, score: v}, true
			}
		}
	}
	return best, found
}

// setDark sets the expected dark fraction of the selected hits and
// tabulates the log-density at it.
func (f *Fitter) setDark(sc *scratch) {
	sc.eps = f.darkFraction(len(sc.sel))
	sc.logRes.fill(&f.res, sc.eps)
}

// shared adds to the statistical errors the event-to-event spreads that
// all hits of an event share, from the calibration at the fitted energy
// (CalibrationPoint.DirSpread, ShiftSpread): the direction's spread in
// quadrature to each angle's, and to the vertex the light point's spread
// across the track, VertexSpread^2 (e1 e1^T + e2 e2^T), and the error of
// moving the light point back to the track start, Shift^2 (sigma_1^2 e1
// e1^T + sigma_2^2 e2 e2^T) across the track from the direction's error
// and ShiftSpread^2 d d^T along it (ShiftSpread/c to the time).
func (f *Fitter) shared(res *Result, cp CalibrationPoint) (angle [2]float64, vertex r3.Vector, time float64) {
	for k := range 2 {
		angle[k] = math.Min(math.Hypot(res.AngleStat[k], cp.DirSpread), math.Pi)
	}
	d := res.Track.Dir
	e1, e2 := phys.Basis(d)
	var cov [3][3]float64
	for i := range 3 {
		for j := range 3 {
			cov[i][j] = res.Cov[i][j]
		}
	}
	add := func(u r3.Vector, v float64) {
		c := [3]float64{u.X, u.Y, u.Z}
		for i := range 3 {
			for j := range 3 {
				cov[i][j] += v * c[i] * c[j]
			}
		}
	}
	s, v := res.Shift, cp.VertexSpread
	add(e1, s*s*angle[0]*angle[0]+v*v)
	add(e2, s*s*angle[1]*angle[1]+v*v)
	add(d, cp.ShiftSpread*cp.ShiftSpread)
	vertex = r3.Vector{X: math.Sqrt(cov[0][0]), Y: math.Sqrt(cov[1][1]), Z: math.Sqrt(cov[2][2])}
	time = math.Hypot(math.Sqrt(res.Cov[3][3]), cp.ShiftSpread/phys.SpeedOfLight)
	return angle, vertex, time
}

// darkFalseRate is the probability with which the selected hits of pure
// dark noise may be taken for an event.
const darkFalseRate = 1e-3

// darkOnly reports whether the selected hits are consistent with dark
// noise alone, with the probability that dark noise puts at least as
// many hits into some selection window of the event's time span: the
// Poisson probability P(N >= n | mu) (mu the expected dark hits of the
// live sensors in one window), times the number of independent windows
// in the span of the hits (a trials factor for the sliding window). The
// hits are taken for an event when that probability is below
// darkFalseRate.
func (f *Fitter) darkOnly(sc *scratch) (float64, bool) {
	mu := f.darkPerNs * f.selWindow
	n := len(sc.sel)
	if !(mu > 0) || n == 0 {
		return 0, false
	}
	span := sc.sorted[len(sc.sorted)-1].Time - sc.sorted[0].Time
	trials := math.Max(1, span/f.selWindow)
	// P(Poisson(mu) >= n) is the regularized lower incomplete gamma P(n, mu).
	p := math.Min(1, trials*mathext.GammaIncReg(float64(n), mu))
	return p, p >= darkFalseRate
}

// suspectAmbiguity is the log-likelihood margin below which a fit is
// flagged (Result.Suspect): a second maximum along the ring axis at
// least ambiguityDistance away that is less than e^4 (about 55) times less
// likely than the best is no safe choice between the two.
// narrowAmbiguity and narrowDirGoodness flag the fits that sit behind
// the true vertex on the ring axis: seen from there the hits lie on a
// cone narrower than the Cherenkov angle's, so the direction likelihood
// is better than the density expects (DirGoodness above 2, which about
// one good fit in ten also reaches), and a second maximum along the axis
// is within a likelihood ratio of e^12.
const (
	narrowAmbiguity   = 12
	narrowDirGoodness = 2
)

// suspectVertexError (cm) is the vertex uncertainty beyond which a fit
// is flagged as well: the hits do not place the event.
const (
	suspectVertexError = 100
	suspectAmbiguity   = 4
	ambiguityDistance  = 200 // cm
)

// ambiguity returns the log-likelihood margin of the maximum x over the
// best point along the ring axis (the mean direction of the prompt hits
// through x) at least ambiguityDistance from x, with the time profiled:
// the valley of a short track's likelihood along its axis has a second
// maximum in some events, and a fit can land on the wrong one. +Inf when
// the axis leaves the tank within that distance on both sides.
func (f *Fitter) ambiguity(sc *scratch, x candidate) float64 {
	f.promptHits(sc, x)
	var axis r3.Vector
	for _, i := range sc.prompt {
		axis = axis.Add(sc.sel[i].s.Sub(x.q).Normalize())
	}
	if len(sc.prompt) < 2 || axis.Norm() == 0 {
		return 0
	}
	axis = axis.Normalize()
	tank := f.det.Tank()
	rMax, zMax := tank.SensorRadius(), tank.SensorHalfHeight()
	reach := 2 * math.Hypot(rMax, zMax)
	v0 := x.q.Mul(f.vg)
	best := math.Inf(1)
	w := 3 * f.sigmaT
	for a := -reach; a <= reach; a += axisStep {
		if math.Abs(a) < ambiguityDistance {
			continue
		}
		p := v0.Add(axis.Mul(a))
		if math.Hypot(p.X, p.Y) > rMax || math.Abs(p.Z) > zMax {
			continue
		}
		q := p.Mul(1 / f.vg)
		_, centre := f.score(sc, q, w)
		for t := centre - 4; t <= centre+4; t += 1 {
			best = math.Min(best, f.nll(sc, q, t))
		}
	}
	return best - x.score
}
