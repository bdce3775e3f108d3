package minimize

import "gonum.org/v1/gonum/mat"

// CurvatureProblem is an objective whose Hessian Curvature measures.
type CurvatureProblem interface {
	// Eval returns the objective at x; the problem may keep state of
	// the evaluation (Shifted reads it).
	Eval(x []float64) float64
	// Shifted returns, when it can, the objective at the point of the
	// last Eval moved by h along variable j, given the value f there,
	// from the stored state instead of a full evaluation. Curvature uses
	// it for the first variable it serves at the origin and only for
	// that one.
	Shifted(j int, f, h float64) (float64, bool)
}

// Curvature returns the Hessian of p at the origin of its dim variables
// by the second-order central formulas with step h,
//
//	H_jj = (f(+j) - 2 f(0) + f(-j)) / h^2
//	H_jk = (f(+j+k) + f(-j-k) - f(+j) - f(-j) - f(+k) - f(-k) + 2 f(0)) / (2 h^2)
//
// which need 2 n + n(n-1) evaluations instead of the 2 n^2 of the
// four-point cross formula; the points that step the variable Shifted
// serves come from the evaluation without that step (for 7 variables with
// one served, 43 evaluations instead of 99 for gonum/diff/fd.Hessian).
// observe, when not nil, is called right after the evaluation at sgn*h
// along each variable j that Shifted does not serve, so that the caller
// can take derivatives of the problem's state.
func Curvature(p CurvatureProblem, dim int, h float64, observe func(j int, sgn float64)) *mat.SymDense {
	hess := mat.NewSymDense(dim, nil)
	x := make([]float64, dim)
	f0 := p.Eval(x)
	fast := -1
	plus, minus := make([]float64, dim), make([]float64, dim)
	for j := 0; j < dim; j++ {
		if fp, ok := p.Shifted(j, f0, h); ok {
			fm, _ := p.Shifted(j, f0, -h)
			fast, plus[j], minus[j] = j, fp, fm
			break
		}
	}
	// f(+j+fast) and f(-j-fast) for the cross terms with the served
	// variable.
	plusF, minusF := make([]float64, dim), make([]float64, dim)
	for j := 0; j < dim; j++ {
		if j == fast {
			continue
		}
		for _, sgn := range []float64{1, -1} {
			x[j] = sgn * h
			v := p.Eval(x)
			if observe != nil {
				observe(j, sgn)
			}
			var vf float64
			if fast >= 0 {
				vf, _ = p.Shifted(fast, v, sgn*h)
			}
			if sgn > 0 {
				plus[j], plusF[j] = v, vf
			} else {
				minus[j], minusF[j] = v, vf
			}
		}
		x[j] = 0
	}
	h2 := h * h
	for j := 0; j < dim; j++ {
		hess.SetSym(j, j, (plus[j]-2*f0+minus[j])/h2)
	}
	for j := 0; j < dim; j++ {
		for k := j + 1; k < dim; k++ {
			var fpp, fmm float64
			switch {
			case j == fast:
				fpp, fmm = plusF[k], minusF[k]
			case k == fast:
				fpp, fmm = plusF[j], minusF[j]
			default:
				x[j], x[k] = h, h
				fpp = p.Eval(x)
				x[j], x[k] = -h, -h
				fmm = p.Eval(x)
				x[j], x[k] = 0, 0
			}
			hess.SetSym(j, k, (fpp+fmm-plus[j]-minus[j]-plus[k]-minus[k]+2*f0)/(2*h2))
		}
	}
	return hess
}
