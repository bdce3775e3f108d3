package ring

import (
	"gonum.org/v1/gonum/mat"
)

// curvature is the numerical Hessian of the objective at the origin of a
// frame, with the derivatives of every sensor's prediction that come with
// it for the Cramer-Rao bound.
type curvature struct {
	hess mat.SymDense
	// dmu[j][i] and dt[j][i] are the central-difference derivatives of
	// sensor i's mean pe and direct-light time in variable j.
	dmu, dt [NumParams][]float64
}

// curvatureAt measures the Hessian of the objective of hypothesis h at
// the origin of fr with steps of size step (scaled units), by the
// second-order central formulas
//
//	H_jj = (f(+j) - 2 f(0) + f(-j)) / step^2
//	H_jk = (f(+j+k) + f(-j-k) - f(+j) - f(-j) - f(+k) - f(-k) + 2 f(0)) / (2 step^2)
//
// which need 2 n + n(n-1) evaluations instead of the 2 n^2 of the four-point
// cross formula. A step in the time moves every predicted time and nothing
// else, so the points that step the time reuse the prediction of the point
// without it and evaluate only the time terms of the hits: 43 predictions
// in all for the 7 parameters (the centre, 12 for the diagonal, 30 for the
// 15 crossings without the time), against 99 for gonum's
// fd.Hessian.
func (w *workspace) curvatureAt(h Hypothesis, fr *frame, step float64) *curvature {
	n := w.f.n
	c := &curvature{}
	c.hess = *mat.NewSymDense(NumParams, nil)
	for j := range c.dmu {
		c.dmu[j], c.dt[j] = make([]float64, n), make([]float64, n)
	}
	x := make([]float64, NumParams)
	shift := scaleTime * step
	// value at x with the time stepped by sgn*step, from the prediction
	// at x with the time unstepped (already in the workspace).
	eval := func() float64 { return w.evalTerms(h, fr, x, nil) }
	withTime := func(f0 float64, sgn float64) float64 {
		return f0 - w.timeShiftNLL(0) + w.timeShiftNLL(sgn*shift)
	}
	// Every sensor's time derivative enters the Cramer-Rao bound.
	w.allTimes = true
	defer func() { w.allTimes = false }()
	f0 := eval()
	fp, fm := withTime(f0, 1), withTime(f0, -1)
	var plus, minus [NumParams]float64
	plus[timeParam], minus[timeParam] = fp, fm
	// The time derivative of every prediction: only the times move.
	for i := 0; i < n; i++ {
		c.dt[timeParam][i] = scaleTime
	}
	// f(+j+t) and f(-j-t) for the time cross terms.
	var plusT, minusT [NumParams]float64
	for j := 0; j < NumParams; j++ {
		if j == timeParam {
			continue
		}
		for _, sgn := range []float64{1, -1} {
			x[j] = sgn * step
			v := eval()
			for i := 0; i < n; i++ {
				c.dmu[j][i] += sgn * (w.muD[i] + w.muI[i]) / (2 * step)
				c.dt[j][i] += sgn * w.tDir[i] / (2 * step)
			}
			if sgn > 0 {
				plus[j], plusT[j] = v, withTime(v, 1)
			} else {
				minus[j], minusT[j] = v, withTime(v, -1)
			}
		}
		x[j] = 0
	}
	s2 := step * step
	for j := 0; j < NumParams; j++ {
		c.hess.SetSym(j, j, (plus[j]-2*f0+minus[j])/s2)
	}
	for j := 0; j < NumParams; j++ {
		for k := j + 1; k < NumParams; k++ {
			var fpp, fmm float64
			switch {
			case j == timeParam:
				fpp, fmm = plusT[k], minusT[k]
			case k == timeParam:
				fpp, fmm = plusT[j], minusT[j]
			default:
				x[j], x[k] = step, step
				fpp = eval()
				x[j], x[k] = -step, -step
				fmm = eval()
				x[j], x[k] = 0, 0
			}
			c.hess.SetSym(j, k, (fpp+fmm-plus[j]-minus[j]-plus[k]-minus[k]+2*f0)/(2*s2))
		}
	}
	return c
}
