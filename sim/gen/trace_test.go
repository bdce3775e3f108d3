package gen

// An independent calculation of the quasi-elastic matrix element by explicit
// Dirac traces (4x4 complex matrices in the Dirac representation), used to
// check the closed-form Llewellyn Smith functions A, B, C.

import (
	"math"
	"math/cmplx"
)

type dmat [4][4]complex128

func (a dmat) mul(b dmat) dmat {
	var c dmat
	for i := 0; i < 4; i++ {
		for k := 0; k < 4; k++ {
			if a[i][k] == 0 {
				continue
			}
			for j := 0; j < 4; j++ {
				c[i][j] += a[i][k] * b[k][j]
			}
		}
	}
	return c
}

func (a dmat) add(b dmat) dmat {
	for i := range a {
		for j := range a[i] {
			a[i][j] += b[i][j]
		}
	}
	return a
}

func (a dmat) scale(s complex128) dmat {
	for i := range a {
		for j := range a[i] {
			a[i][j] *= s
		}
	}
	return a
}

func (a dmat) trace() complex128 { return a[0][0] + a[1][1] + a[2][2] + a[3][3] }

func (a dmat) dagger() dmat {
	var c dmat
	for i := range a {
		for j := range a[i] {
			c[j][i] = cmplx.Conj(a[i][j])
		}
	}
	return c
}

func identity() dmat {
	var c dmat
	for i := 0; i < 4; i++ {
		c[i][i] = 1
	}
	return c
}

// gammas returns gamma^0..3 and gamma_5 = i gamma^0 gamma^1 gamma^2 gamma^3.
func gammas() (g [4]dmat, g5 dmat) {
	pauli := [3][2][2]complex128{
		{{0, 1}, {1, 0}},
		{{0, -1i}, {1i, 0}},
		{{1, 0}, {0, -1}},
	}
	g[0] = dmat{{1, 0, 0, 0}, {0, 1, 0, 0}, {0, 0, -1, 0}, {0, 0, 0, -1}}
	for k := 0; k < 3; k++ {
		for i := 0; i < 2; i++ {
			for j := 0; j < 2; j++ {
				g[k+1][i][j+2] = pauli[k][i][j]
				g[k+1][i+2][j] = -pauli[k][i][j]
			}
		}
	}
	g5 = g[0].mul(g[1]).mul(g[2]).mul(g[3]).scale(1i)
	return g, g5
}

var metric = [4]float64{1, -1, -1, -1}

// slash returns p-slash = gamma^mu p_mu for the contravariant p.
func slash(g [4]dmat, p [4]float64) dmat {
	var c dmat
	for mu := 0; mu < 4; mu++ {
		c = c.add(g[mu].scale(complex(metric[mu]*p[mu], 0)))
	}
	return c
}

// traceDSigma returns d sigma/dQ2 (cm^2/MeV^2) for a neutrino (anti=false:
// nu n -> l- p) or antineutrino of energy e on a nucleon of mass mi at rest
// going to mass mf, computed from |M|^2 = G^2 cos^2/2 L_{mu nu} H^{mu nu}
// with explicit traces, the vertex
// gamma^mu F1 + i sigma^{mu nu} q_nu xiF2/(2M) + gamma^mu gamma5 FA + q^mu gamma5 FP/M,
// q = p' - p, and d sigma/dt = |M|^2/(16 pi (s - mi^2)^2).
func traceDSigma(m qeModel, anti bool, e, q2, mi, mf float64) float64 {
	g, g5 := gammas()
	one := identity()
	ml := m.lepMass
	// Kinematics in the lab: q0 from (P + q)^2 = mf^2.
	q0 := (q2 + mf*mf - mi*mi) / (2 * mi)
	el := e - q0
	pl := math.Sqrt(el*el - ml*ml)
	cos := (2*e*el - ml*ml - q2) / (2 * e * pl)
	sin := math.Sqrt(math.Max(0, 1-cos*cos))
	k := [4]float64{e, 0, 0, e}
	kl := [4]float64{el, pl * sin, 0, pl * cos}
	p := [4]float64{mi, 0, 0, 0}
	var pp, q [4]float64
	for mu := range q {
		q[mu] = k[mu] - kl[mu]
		pp[mu] = p[mu] + q[mu]
	}
	f1, xf2, fa, fp := m.formFactors(q2)
	M := nucleonMass
	sigma := func(mu, nu int) dmat { // sigma^{mu nu} = i/2 [g^mu, g^nu]
		return g[mu].mul(g[nu]).add(g[nu].mul(g[mu]).scale(-1)).scale(0.5i)
	}
	var vertex, vbar [4]dmat
	for mu := 0; mu < 4; mu++ {
		v := g[mu].scale(complex(f1, 0))
		for nu := 0; nu < 4; nu++ {
			v = v.add(sigma(mu, nu).scale(complex(0, metric[nu]*q[nu]*xf2/(2*M))))
		}
		v = v.add(g[mu].mul(g5).scale(complex(fa, 0)))
		v = v.add(g5.scale(complex(q[mu]*fp/M, 0)))
		vertex[mu] = v
		vbar[mu] = g[0].mul(v.dagger()).mul(g[0])
	}
	pl5 := one.add(g5.scale(-1)) // 1 - gamma5
	var lt, ht [4][4]complex128
	ks, kls := slash(g, k), slash(g, kl)
	ps, pps := slash(g, p).add(one.scale(complex(mi, 0))), slash(g, pp).add(one.scale(complex(mf, 0)))
	for mu := 0; mu < 4; mu++ {
		for nu := 0; nu < 4; nu++ {
			a, b := g[mu].mul(pl5), g[nu].mul(pl5)
			if anti {
				lt[mu][nu] = a.mul(kls.add(one.scale(complex(-ml, 0)))).mul(b).mul(ks).trace()
			} else {
				lt[mu][nu] = a.mul(ks).mul(b).mul(kls.add(one.scale(complex(ml, 0)))).trace()
			}
			ht[mu][nu] = vertex[mu].mul(ps).mul(vbar[nu]).mul(pps).trace()
		}
	}
	var lh complex128
	for mu := 0; mu < 4; mu++ {
		for nu := 0; nu < 4; nu++ {
			lh += lt[mu][nu] * ht[mu][nu] * complex(metric[mu]*metric[nu], 0)
		}
	}
	gg := fermiCoupling * cosCabibbo
	m2 := gg * gg / 2 * real(lh) / 2 // average over the nucleon spin
	return m2 / (64 * math.Pi * mi * mi * e * e) * cm2PerInvMeV2
}
