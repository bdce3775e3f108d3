package em

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/integrate/quad"

	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
)

// Energy grid of the tables: log-spaced from gridMin to MaxEkin (MeV),
// gridPerDecade points per decade, interpolated linearly in ln E (a 2.3%
// spacing: the interpolation error of the smooth tables is below 1e-4).
const (
	gridMin       = 1e-3
	gridPerDecade = 100
)

// Physics holds the cross-section and stopping-power tables of one medium
// and one Config. It is immutable after New and safe for concurrent use;
// every method that draws random numbers takes its own *rand.Rand.
type Physics struct {
	cfg     Config
	density float64 // g/cm^3
	x0      float64 // radiation length, cm
	pref    float64 // (K/2) (Z/A) rho, MeV/cm: multiplies the collision brackets
	iM2     float64 // (I/m)^2
	betaTh  float64 // Cherenkov threshold speed 1/n
	med     material.Medium
	atoms   []atom

	lnMin, invStep float64 // ln E of the first node, nodes per unit ln E
	n              int

	eminus, eplus charged
	radTotal      []float64 // radiative stopping power, MeV/cm, all k
	brem          bremsTables
	gamma         photonTables
	bremsMax      float64 // bound of bremsShape
}

// charged holds the tables of one charge sign, all per cm.
type charged struct {
	dedx      []float64 // continuous loss: restricted collision + radiation below BremsCut, MeV/cm
	rangeCont []float64 // path length to lose all energy continuously at dedx, cm
	delta     []float64 // Moller or Bhabha above DeltaCut, 1/cm
	annih     []float64 // two-photon annihilation in flight (e+ only), 1/cm
	total     []float64 // sum of the discrete processes, 1/cm
	csda      []float64 // CSDA range with the unrestricted stopping power, cm
}

type bremsTables struct {
	sigma []float64 // bremsstrahlung above BremsCut, 1/cm
	soft  []float64 // radiative loss below BremsCut, MeV/cm
}

type photonTables struct {
	compton, pairNuc, pairEl, photo, total []float64 // 1/cm
}

// New checks the medium and the configuration and computes the tables.
// The photoelectric table is that of water (NIST XCOM); for another
// medium it is scaled by density only.
func New(m material.Medium, cfg Config) (*Physics, error) {
	if err := cfg.Validate(); err != nil {
		return nil, err
	}
	if err := checkMedium(m); err != nil {
		return nil, err
	}
	p := &Physics{
		cfg:     cfg,
		density: m.Density,
		x0:      m.RadiationLength,
		pref:    phys.BetheK / 2 * m.ZOverA * m.Density,
		iM2:     math.Pow(m.MeanExcitation/phys.ElectronMass, 2),
		betaTh:  1 / cfg.RefractiveIndex,
		med:     m,
	}
	for _, el := range m.Elements {
		p.atoms = append(p.atoms, newAtom(el.Z, el.A, el.MassFraction, m.Density))
	}
	p.bremsMax = bremsShapeMax(p.atoms)
	p.lnMin = math.Log(gridMin)
	p.invStep = gridPerDecade / math.Ln10
	p.n = int(math.Round(math.Log10(MaxEkin/gridMin)*gridPerDecade)) + 1
	p.buildBrems()
	p.eminus = p.buildCharged(false)
	p.eplus = p.buildCharged(true)
	p.buildPhoton()
	return p, nil
}

func checkMedium(m material.Medium) error {
	pos := func(name string, v float64) error {
		if !(v > 0) || math.IsInf(v, 0) {
			return fmt.Errorf("em: Medium.%s = %g must be positive and finite", name, v)
		}
		return nil
	}
	if err := errors.Join(pos("Density", m.Density), pos("ZOverA", m.ZOverA),
		pos("MeanExcitation", m.MeanExcitation), pos("RadiationLength", m.RadiationLength)); err != nil {
		return err
	}
	if len(m.Elements) == 0 {
		return errors.New("em: Medium.Elements is empty")
	}
	for i, el := range m.Elements {
		if el.Z < 1 || !(el.A > 0) || !(el.MassFraction > 0 && el.MassFraction <= 1) {
			return fmt.Errorf("em: Medium.Elements[%d] = %+v needs Z >= 1, A > 0, 0 < MassFraction <= 1", i, el)
		}
	}
	return nil
}

// Config returns the configuration the tables were built with.
func (p *Physics) Config() Config { return p.cfg }

// energy returns the energy of table node i.
func (p *Physics) energy(i int) float64 { return math.Exp(p.lnMin + float64(i)/p.invStep) }

// locate returns the node below e and the fraction of the way to the next
// one, clamped to the table.
func (p *Physics) locate(e float64) (int, float64) {
	u := (math.Log(e) - p.lnMin) * p.invStep
	if u <= 0 {
		return 0, 0
	}
	i := int(u)
	if i >= p.n-1 {
		return p.n - 2, 1
	}
	return i, u - float64(i)
}

func lerp(tab []float64, i int, f float64) float64 { return tab[i] + f*(tab[i+1]-tab[i]) }

func (p *Physics) at(tab []float64, e float64) float64 {
	i, f := p.locate(e)
	return lerp(tab, i, f)
}

// gaussLegendre is an n-point rule on [0, 1].
type gaussLegendre struct{ x, w []float64 }

func newGaussLegendre(n int) gaussLegendre {
	g := gaussLegendre{make([]float64, n), make([]float64, n)}
	quad.Legendre{}.FixedLocations(g.x, g.w, 0, 1)
	return g
}

func (g gaussLegendre) integrate(f func(float64) float64, a, b float64) float64 {
	var s float64
	for i, x := range g.x {
		s += g.w[i] * f(a+(b-a)*x)
	}
	return s * (b - a)
}

// collision returns the collision stopping power (MeV/cm) restricted to
// transfers below cut (MeV); cut = +Inf gives the unrestricted one.
func (p *Physics) collision(positron bool, ekin, cut float64) float64 {
	tau := ekin / phys.ElectronMass
	gamma, beta2 := kinematics(tau)
	delta := p.med.DensityEffect(math.Sqrt(gamma*gamma - 1))
	var b float64
	if x := cut / ekin; x < maxTransfer(positron) {
		b = restrictedBracket(positron, tau, x, p.iM2, delta)
	} else {
		b = collisionBracket(positron, tau, p.iM2, delta)
	}
	return p.pref / beta2 * math.Max(b, 0)
}

// radiative returns the bremsstrahlung energy loss (MeV/cm) into photons
// of energy k0..k1 of an electron of kinetic energy ekin.
func (p *Physics) radiative(ekin, k0, k1 float64, g gaussLegendre) float64 {
	e := ekin + phys.ElectronMass
	k1 = math.Min(k1, ekin)
	if k1 <= k0 {
		return 0
	}
	f := func(k float64) float64 { return bremsShape(p.atoms, e, k) }
	// Up to half the kinetic energy the integrand is smooth in k; near the
	// tip it varies with ln E', so integrate there in ln E'.
	mid := math.Max(k0, math.Min(k1, ekin/2))
	s := g.integrate(f, k0, mid)
	if k1 > mid {
		fe := func(lnEp float64) float64 {
			ep := math.Exp(lnEp)
			return f(e-ep) * ep
		}
		s += g.integrate(fe, math.Log(e-k1), math.Log(e-mid))
	}
	return alphaRe2x4 * s
}

func (p *Physics) buildBrems() {
	g := newGaussLegendre(48)
	kc := p.cfg.BremsCut
	p.radTotal = make([]float64, p.n)
	p.brem.sigma = make([]float64, p.n)
	p.brem.soft = make([]float64, p.n)
	for i := range p.n {
		t := p.energy(i)
		e := t + phys.ElectronMass
		p.radTotal[i] = p.radiative(t, 0, t, g)
		p.brem.soft[i] = p.radiative(t, 0, kc, g)
		if t > kc {
			f := func(lnk float64) float64 { return bremsShape(p.atoms, e, math.Exp(lnk)) }
			p.brem.sigma[i] = alphaRe2x4 * g.integrate(f, math.Log(kc), math.Log(t))
		}
	}
}

func (p *Physics) buildCharged(positron bool) charged {
	c := charged{
		dedx: make([]float64, p.n), rangeCont: make([]float64, p.n), delta: make([]float64, p.n),
		annih: make([]float64, p.n), total: make([]float64, p.n), csda: make([]float64, p.n),
	}
	nel := p.med.ElectronDensity()
	sTot := make([]float64, p.n)
	for i := range p.n {
		t := p.energy(i)
		tau := t / phys.ElectronMass
		c.dedx[i] = p.collision(positron, t, p.cfg.DeltaCut) + p.brem.soft[i]
		c.delta[i] = p.pref / t * deltaCrossBracket(positron, tau, p.cfg.DeltaCut/t)
		if positron {
			c.annih[i] = nel * heitler(tau+1)
		}
		c.total[i] = c.delta[i] + p.brem.sigma[i] + c.annih[i]
		sTot[i] = p.collision(positron, t, math.Inf(1)) + p.radTotal[i]
	}
	integrateRange(c.rangeCont, c.dedx, p)
	integrateRange(c.csda, sTot, p)
	return c
}

// integrateRange fills r with the integral of dE/S from zero: trapezoidal
// in ln E over the grid, and E0/(2 S(E0)) below the first node (S ~ 1/E
// there; the term is below 1e-5 cm).
func integrateRange(r, s []float64, p *Physics) {
	h := 1 / p.invStep
	e0 := p.energy(0)
	r[0] = e0 / (2 * s[0])
	prev := e0 / s[0]
	for i := 1; i < len(r); i++ {
		cur := p.energy(i) / s[i]
		r[i] = r[i-1] + h*(prev+cur)/2
		prev = cur
	}
}

func (p *Physics) buildPhoton() {
	g := newGaussLegendre(48)
	t := photonTables{
		compton: make([]float64, p.n), pairNuc: make([]float64, p.n), pairEl: make([]float64, p.n),
		photo: make([]float64, p.n), total: make([]float64, p.n),
	}
	nel := p.med.ElectronDensity()
	const m = phys.ElectronMass
	for i := range p.n {
		k := p.energy(i)
		t.compton[i] = nel * kleinNishina(k)
		t.photo[i] = p.density * photoelectricMassAtt(k)
		if k > 2*m {
			nuc := func(x float64) float64 { n, _ := pairShape(p.atoms, k, x, false); return n }
			el := func(x float64) float64 { _, e := pairShape(p.atoms, k, x, true); return e }
			// symmetric in x <-> 1-x: twice the lower half
			t.pairNuc[i] = 2 * alphaRe2x4 * g.integrate(nuc, m/k, 0.5)
			t.pairEl[i] = 2 * alphaRe2x4 * g.integrate(el, m/k, 0.5)
		}
		t.total[i] = t.compton[i] + t.pairNuc[i] + t.pairEl[i] + t.photo[i]
	}
	p.gamma = t
}
