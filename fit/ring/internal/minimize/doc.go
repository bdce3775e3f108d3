// Package minimize minimizes an objective that is a sum of independent
// terms (the per-sensor terms of a likelihood) plus a smooth penalty, by
// Levenberg-Marquardt-damped scoring (Scoring), and measures the
// curvature at the minimum by central differences (Curvature).
//
// One forward-difference pass over the parameters gives every term's
// score s_i = d(term_i)/dx as well as the gradient g = sum_i s_i, and the
// outer product B = sum_i s_i s_i^T (Berndt-Hall-Hall-Hausman) estimates
// the Fisher information, which the expectation of the Hessian equals
// when the model is right; the penalty's own curvature, which no term
// carries, is added to its diagonal. The step solves (B + lambda diag B)
// d = -g. A parabola through the value, the slope along d and the value
// at the step corrects the step length when B misjudges the curvature,
// and damped BFGS secant updates correct B itself along the steps taken
// (Nocedal and Wright, Numerical Optimization, 2nd ed., procedure 18.2),
// B starting again from the scores when the problem re-anchors its
// variables. A quasi-Newton method starting from the identity has to
// learn this matrix over many iterations; with it a fit converges in a
// handful.
//
// The search stops when the expected gain of a full step, g^T B^-1 g / 2,
// is below Settings.DecrementTol, or after two accepted steps in a row
// that each gained less than Settings.FloorGain (the noise floor of an
// objective built on interpolated tables).
//
// Both let the problem serve a variable from stored state instead of a
// full evaluation (a time offset that moves only predicted times):
// Problem.FastScore for the scores, CurvatureProblem.Shifted for the
// Hessian.
package minimize
