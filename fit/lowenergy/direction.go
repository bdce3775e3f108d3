package lowenergy

import (
	"math"

	"github.com/golang/geo/r3"
	"gonum.org/v1/gonum/diff/fd"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/optimize"

	"github.com/conelight/conelight/sim/phys"
)

// dirHessianStep (rad) is the finite-difference step of the direction
// curvature.
const dirHessianStep = 0.03

// fitDirection maximizes the likelihood of the cosines between the track
// direction and the vertex-to-hit vectors of the prompt hits. It returns
// the direction, the uncertainties of the two angles along the axes of
// phys.Basis of the direction, whether they come from a positive definite
// curvature, and the log-likelihood. Without enough prompt hits, or
// without a positive definite curvature, the direction is the best one
// found and the uncertainties are pi (no information).
func (f *Fitter) fitDirection(sc *scratch, x candidate) (dir r3.Vector, angleErr [2]float64, ok bool, logL float64) {
	noInfo := [2]float64{math.Pi, math.Pi}
	units := sc.units[:0]
	var mean r3.Vector
	for _, i := range sc.prompt {
		u := sc.sel[i].s.Sub(x.q).Normalize()
		units = append(units, u)
		mean = mean.Add(u)
	}
	sc.units = units
	if len(units) < 2 || mean.Norm() == 0 {
		if mean.Norm() == 0 {
			mean = r3.Vector{Z: 1}
		}
		return mean.Normalize(), noInfo, false, 0
	}
	eps := math.Min(math.Max(f.darkPerNs*(f.promptHi-f.promptLo)/float64(len(units)), minDarkFraction), 0.95)
	sc.logDir.fillGrid(&f.dirDensity, eps, 0.5)
	nll := func(u r3.Vector) float64 {
		sum := 0.0
		for _, v := range units {
			lg, _ := sc.logDir.at(u.Dot(v))
			sum -= lg
		}
		return sum
	}
	// Seed: the best of a uniform set of directions and the mean hit
	// direction (the cone axis for a symmetric ring).
	seed := mean.Normalize()
	best := nll(seed)
	for _, u := range f.fibonacci {
		if v := nll(u); v < best {
			seed, best = u, v
		}
	}
	tangent := func(u r3.Vector, a, b float64) r3.Vector {
		e1, e2 := phys.Basis(u)
		return u.Add(e1.Mul(a)).Add(e2.Mul(b)).Normalize()
	}
	p := optimize.Problem{Func: func(ab []float64) float64 { return nll(tangent(seed, ab[0], ab[1])) }}
	settings := &optimize.Settings{
		MajorIterations: f.maxIter,
		Runtime:         f.maxDur,
		Converger:       &optimize.FunctionConverge{Absolute: 1e-6, Iterations: 30},
	}
	dir = seed
	if r, err := optimize.Minimize(p, []float64{0, 0}, settings, &optimize.NelderMead{SimplexSize: 0.1}); err == nil || r != nil {
		if r != nil && r.F < best && finiteSlice(r.X) {
			dir, best = tangent(seed, r.X[0], r.X[1]), r.F
		}
	}
	// Curvature in tangent coordinates around the maximum.
	h := mat.NewSymDense(2, nil)
	fd.Hessian(h, func(ab []float64) float64 { return nll(tangent(dir, ab[0], ab[1])) }, []float64{0, 0},
		&fd.Settings{Formula: fd.Central, Step: dirHessianStep})
	var cov [2][2]float64
	if !invertSym(mat.DenseCopyOf(h), [][]float64{cov[0][:], cov[1][:]}) {
		return dir, noInfo, false, -best
	}
	angleErr = [2]float64{math.Min(math.Sqrt(cov[0][0]), math.Pi), math.Min(math.Sqrt(cov[1][1]), math.Pi)}
	return dir, angleErr, true, -best
}

// dirMoments returns the mean and variance of log p under p, the
// tabulated direction density (with its dark part) over the cosine range
// [-1, 1], from the log table of the event: the reference of
// Result.DirGoodness.
func dirMoments(t *logTable) (mean, variance float64) {
	var m1, m2, norm float64
	for i, lf := range t.lf {
		u := t.lo + float64(i)*t.step
		if u < -1 || u > 1 {
			continue
		}
		p := math.Exp(lf) * t.step
		norm += p
		m1 += p * lf
		m2 += p * lf * lf
	}
	if !(norm > 0) {
		return 0, 0
	}
	m1 /= norm
	return m1, math.Max(m2/norm-m1*m1, 0)
}
