package minimize

import "gonum.org/v1/gonum/mat"

// Sandwich returns the robust (sandwich) covariance H^-1 J H^-1 of an
// objective that is a sum of independent terms, from the inverse Hessian
// hinv of the objective at its minimum and every term's score (its
// gradient there), scores[j][i] the derivative of term i in variable j;
// J = sum_i s_i s_i^T is the observed variance of the scores.
//
// When each term is the negative log likelihood of an independent
// observation and the model is right, J and H agree on average and the
// sandwich is the inverse Hessian. When the model's spread of the
// observations is wrong (a time density narrower or wider than the
// residuals, a charge variance that is not the model's), H follows the
// model's curvature while J follows the actual scatter of the scores, and
// H^-1 J H^-1 is still the covariance of the estimate (Huber 1967; White
// 1982, "Maximum likelihood estimation of misspecified models",
// Econometrica 50, 1).
func Sandwich(hinv *mat.SymDense, scores [][]float64) *mat.SymDense {
	dim := hinv.SymmetricDim()
	J := mat.NewSymDense(dim, nil)
	for a := 0; a < dim; a++ {
		for b := a; b < dim; b++ {
			var s float64
			sa, sb := scores[a], scores[b]
			for i := range sa {
				s += sa[i] * sb[i]
			}
			J.SetSym(a, b, s)
		}
	}
	var tmp mat.Dense
	tmp.Mul(hinv, J)
	var full mat.Dense
	full.Mul(&tmp, hinv)
	out := mat.NewSymDense(dim, nil)
	for a := 0; a < dim; a++ {
		for b := a; b < dim; b++ {
			out.SetSym(a, b, 0.5*(full.At(a, b)+full.At(b, a)))
		}
	}
	return out
}
