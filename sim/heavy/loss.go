package heavy

import (
	"fmt"
	"math"

	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
)

// Energy range of the tables and of the public functions, MeV.
const (
	// MinTableEnergy is the lowest kinetic energy of the stopping-power and
	// range tables: the Bethe formula holds down to beta*gamma ~ 0.1
	// (T ~ 0.5 MeV for a muon, 0.7 MeV for a pion, 5 MeV for a proton);
	// below, shell, Barkas and Bloch corrections are needed (PDG Review,
	// "Passage of particles through matter"). For protons the table still
	// starts at 1 MeV: the uncorrected formula is a few per cent high
	// there, which shortens the range of a 10 MeV proton by about 1%.
	MinTableEnergy = 1.0
	// MaxEnergy is the highest kinetic energy accepted (10 TeV). Above a
	// few hundred GeV radiative losses are stochastic and a continuous
	// b(E) E term gives the mean only.
	MaxEnergy = 1e7
)

// pointsPerDecade sets the table spacing; log-log interpolation between
// points spaced by 0.01 in log10 T is accurate to ~1e-5.
const pointsPerDecade = 100

// Physics holds the energy-loss tables of one species in one medium and
// the transport settings. It is immutable after New and safe for
// concurrent use.
type Physics struct {
	cfg       Config
	sp        Species
	name      string
	rho       float64 // g/cm^3
	zOverA    float64 // mol/g
	meanExc   float64 // I, MeV
	x0        float64 // radiation length, cm
	deltaNorm float64 // (K/2) (Z/A) rho, MeV/cm: the delta-ray cross-section prefactor
	med       material.Medium
	thrBeta   float64 // 1/ThresholdIndex

	lnT0, dlnT float64   // grid: ln T_i = lnT0 + i dlnT
	lnRangeCut []float64 // ln of the range (g/cm^2) with the continuous loss below DeltaCut
	lnRangeAll []float64 // ln of the CSDA range (g/cm^2) with the total loss
	sigma      []float64 // delta-ray cross-section above DeltaCut, 1/cm

	// lnSpan[i] is the log energy span -ln(1 - 2 f) over which the
	// delta-ray bound is taken, for f = MaxFracLoss (i = 0) and
	// MaxFracLossBelowThreshold (i = 1).
	lnSpan [2]float64

	// hadronic is the macroscopic hadronic interaction cross-section
	// (1/cm) on the energy grid, nil when the species has none.
	hadronic []float64

	frozen bool // test hook: no energy loss, no deltas (multiple scattering only)
}

// New builds the tables of species sp for medium m with settings cfg
// (zero fields take their defaults).
func New(m material.Medium, sp Species, cfg Config) (*Physics, error) {
	if err := cfg.Validate(); err != nil {
		return nil, err
	}
	if err := sp.check(); err != nil {
		return nil, err
	}
	sp = sp.withDerived()
	cfg = cfg.withDefaults()
	checks := []struct {
		name string
		v    float64
		hi   float64
	}{
		{"Density", m.Density, 30},
		{"ZOverA", m.ZOverA, 1},
		{"MeanExcitation", m.MeanExcitation, 1e-3},
		{"RadiationLength", m.RadiationLength, 1e6},
	}
	for _, c := range checks {
		if err := checkRange("Medium."+c.name, c.v, 0, c.hi, true); err != nil {
			return nil, err
		}
	}
	p := &Physics{
		cfg:       cfg,
		sp:        sp,
		name:      m.Name,
		rho:       m.Density,
		zOverA:    m.ZOverA,
		meanExc:   m.MeanExcitation,
		x0:        m.RadiationLength,
		deltaNorm: phys.BetheK / 2 * m.ZOverA * m.Density,
		med:       m,
		thrBeta:   1 / cfg.ThresholdIndex,
		lnSpan:    [2]float64{-math.Log(1 - 2*cfg.MaxFracLoss), -math.Log(1 - 2*cfg.MaxFracLossBelowThreshold)},
	}
	p.buildTables()
	return p, nil
}

// Config returns the settings in use (defaults filled in).
func (p *Physics) Config() Config { return p.cfg }

// Species returns the particle species the tables are for.
func (p *Physics) Species() Species { return p.sp }

// Medium returns the medium the tables are for.
func (p *Physics) Medium() material.Medium { return p.med }

// Kinematics holds the kinematic quantities of a particle of the species
// at one kinetic energy.
type Kinematics = kinematics

// Kinematics returns the kinematics of the species at kinetic energy ekin
// (MeV).
func (p *Physics) Kinematics(ekin float64) Kinematics { return p.kin(ekin) }

// kinematics of a particle of given kinetic energy.
type kinematics struct {
	ekin  float64 // MeV
	e     float64 // total energy, MeV
	p     float64 // momentum, MeV/c
	beta2 float64
	bg2   float64 // (beta gamma)^2
	tmax  float64 // largest energy transfer to a free electron, MeV
}

// Ekin returns the kinetic energy (MeV).
func (k kinematics) Ekin() float64 { return k.ekin }

// Etot returns the total energy (MeV).
func (k kinematics) Etot() float64 { return k.e }

// Momentum returns |p| (MeV/c).
func (k kinematics) Momentum() float64 { return k.p }

// Beta returns v/c.
func (k kinematics) Beta() float64 { return math.Sqrt(k.beta2) }

// Tmax returns the largest kinetic energy (MeV) a free electron can
// receive in one collision, W_max.
func (k kinematics) Tmax() float64 { return k.tmax }

// kin returns the kinematics at kinetic energy ekin. The mass terms are
// precomputed per species (withDerived), so that they are the same
// floating-point numbers whatever the species.
func (p *Physics) kin(ekin float64) kinematics {
	const me = phys.ElectronMass
	m := p.sp.Mass
	e := ekin + m
	gamma := e / m
	bg2 := ekin * (ekin + 2*m) / p.sp.mass2
	// PDG Review, "Passage of particles through matter", W_max with the
	// m_e/M terms.
	r := p.sp.ratio
	tmax := 2 * me * bg2 / (1 + 2*gamma*r + r*r)
	return kinematics{
		ekin:  ekin,
		e:     e,
		p:     m * math.Sqrt(bg2),
		beta2: bg2 / (gamma * gamma),
		bg2:   bg2,
		tmax:  tmax,
	}
}

// collision returns the mean collision stopping power (MeV cm^2/g) from
// transfers below tup (tup >= tmax gives the full Bethe formula):
//
//	K (Z/A)/beta^2 [ 1/2 ln(2 m_e c^2 beta^2 gamma^2 T_up / I^2)
//	  - beta^2/2 (1 + T_up/W_max) - delta/2 + T_up^2/(8 E^2) ]
//
// (PDG Review, "Passage of particles through matter": Bethe formula and
// its restricted form; the last term is the spin-1/2 term that follows
// from the T^2/(2E^2) part of the delta-ray cross-section, so that the
// restricted loss plus the explicit delta rays add up to the total),
// plus the radiative correction to ionization from bremsstrahlung off the
// struck electrons (Kelner, Kokoulin, Petrukhin, as given in the PDG Review
// muon energy-loss section for muons, with M in place of m_mu for other
// species; form from memory):
//
//	K/(4 pi) (Z/A) alpha [ln(2E/M) - ln(2 W_max/m_e)/3] ln^2(2 W_max/m_e),
//
// which is below 0.2% at 1 GeV and about 1% at 10 GeV.
func (p *Physics) collision(k kinematics, tup float64) float64 {
	const me = phys.ElectronMass
	if tup > k.tmax {
		tup = k.tmax
	}
	delta := p.med.DensityEffect(math.Sqrt(k.bg2))
	b := 0.5*math.Log(2*me*k.bg2*tup/(p.meanExc*p.meanExc)) -
		k.beta2/2*(1+tup/k.tmax) - delta/2 + tup*tup/(8*k.e*k.e)
	s := phys.BetheK * p.zOverA / k.beta2 * b
	l := math.Log(2 * k.tmax / me)
	if kkp := phys.BetheK / (4 * math.Pi) * p.zOverA * phys.FineStructure *
		(math.Log(2*k.e/p.sp.Mass) - l/3) * l * l; kkp > 0 {
		s += kkp
	}
	return s
}

// radiativeB is b_total(E) = b_brems + b_pair + b_photonuclear for liquid
// water in 1e-6 g^-1 cm^2 against total energy E in GeV (Groom, Mokhov,
// Striganov, Atomic Data and Nuclear Data Tables 78 (2001) 183; values
// from memory, good to ~15%). Radiative losses b E are below 1% of the
// ionization loss up to 10 GeV, so this accuracy matters only above.
var radiativeB = [...]struct{ eGeV, b float64 }{
	{1, 1.0},
	{10, 1.7},
	{100, 2.4},
	{1000, 2.9},
	{10000, 3.2},
}

// radiative returns the continuous radiative loss b(E) E in MeV cm^2/g,
// with b interpolated linearly in ln E and held constant outside the
// table.
func radiative(e float64) float64 {
	eg := e / 1000
	n := len(radiativeB)
	var b float64
	switch {
	case eg <= radiativeB[0].eGeV:
		b = radiativeB[0].b
	case eg >= radiativeB[n-1].eGeV:
		b = radiativeB[n-1].b
	default:
		i := 1
		for radiativeB[i].eGeV < eg {
			i++
		}
		lo, hi := radiativeB[i-1], radiativeB[i]
		f := math.Log(eg/lo.eGeV) / math.Log(hi.eGeV/lo.eGeV)
		b = lo.b + f*(hi.b-lo.b)
	}
	return b * 1e-6 * e
}

// continuous is the stopping power (MeV cm^2/g) applied along a step:
// collisions below tup plus, for species with Radiative set, the
// radiative losses.
func (p *Physics) continuous(ekin, tup float64) float64 {
	k := p.kin(ekin)
	if !p.sp.Radiative {
		return p.collision(k, tup)
	}
	return p.collision(k, tup) + radiative(k.e)
}

// deltaSigmaOf returns the cross-section (1/cm) for delta rays with
// kinetic energy above tcut, the integral of the spin-1/2 differential
// cross-section (see sampleDeltaEnergy) from tcut to W_max:
//
//	(K/2)(Z/A) rho / beta^2 [1/T_c - 1/W - (beta^2/W) ln(W/T_c) + (W - T_c)/(2E^2)].
func (p *Physics) deltaSigmaOf(k kinematics, tcut float64) float64 {
	if k.tmax <= tcut {
		return 0
	}
	w := k.tmax
	b := 1/tcut - 1/w - k.beta2/w*math.Log(w/tcut) + (w-tcut)/(2*k.e*k.e)
	return p.deltaNorm / k.beta2 * b
}

func (p *Physics) buildTables() {
	p.lnT0 = math.Log(MinTableEnergy)
	p.dlnT = math.Ln10 / pointsPerDecade
	n := int(math.Round(math.Log10(MaxEnergy/MinTableEnergy)*pointsPerDecade)) + 1
	p.lnRangeCut = make([]float64, n)
	p.lnRangeAll = make([]float64, n)
	p.sigma = make([]float64, n)
	if p.sp.Interaction != nil {
		p.hadronic = make([]float64, n)
	}
	tcut := p.cfg.DeltaCut
	// Residual range below the first point: with S ~ T^(-1/2) (the 1/beta^2
	// law with a slowly varying logarithm), R(T) = (2/3) T / S(T). It is
	// 0.013 g/cm^2 for water at 1 MeV, negligible next to any range used.
	t0 := MinTableEnergy
	rCut := 2. / 3 * t0 / p.continuous(t0, tcut)
	rAll := 2. / 3 * t0 / p.continuous(t0, math.Inf(1))
	// 4-point Gauss-Legendre in ln T over each interval: dR = T dlnT / S(T).
	gx := [4]float64{-0.8611363115940526, -0.3399810435848563, 0.3399810435848563, 0.8611363115940526}
	gw := [4]float64{0.3478548451374538, 0.6521451548625461, 0.6521451548625461, 0.3478548451374538}
	for i := 0; i < n; i++ {
		lt := p.lnT0 + float64(i)*p.dlnT
		if i > 0 {
			mid := lt - p.dlnT/2
			for j := range gx {
				t := math.Exp(mid + gx[j]*p.dlnT/2)
				w := gw[j] * p.dlnT / 2 * t
				rCut += w / p.continuous(t, tcut)
				rAll += w / p.continuous(t, math.Inf(1))
			}
		}
		p.lnRangeCut[i] = math.Log(rCut)
		p.lnRangeAll[i] = math.Log(rAll)
		p.sigma[i] = p.deltaSigmaOf(p.kin(math.Exp(lt)), tcut)
		if p.sp.Interaction != nil {
			p.hadronic[i] = p.sp.Interaction(math.Exp(lt))
		}
	}
}

// gridPos returns the interval index i and the fraction f in it for
// kinetic energy t (clamped to the table).
func (p *Physics) gridPos(t float64) (int, float64) {
	x := (math.Log(t) - p.lnT0) / p.dlnT
	last := len(p.sigma) - 1
	if !(x > 0) {
		return 0, 0
	}
	if x >= float64(last) {
		return last - 1, 1
	}
	i := int(x)
	return i, x - float64(i)
}

// rangeOf returns the range (g/cm^2) at kinetic energy t in table lnR,
// interpolated linearly in ln R against ln T.
func (p *Physics) rangeOf(lnR []float64, t float64) float64 {
	i, f := p.gridPos(t)
	return math.Exp(lnR[i] + f*(lnR[i+1]-lnR[i]))
}

// energyOf inverts rangeOf exactly (the same interpolation read the other
// way), by bisection over the table.
func (p *Physics) energyOf(lnR []float64, r float64) float64 {
	if !(r > 0) {
		return MinTableEnergy
	}
	lr := math.Log(r)
	if lr <= lnR[0] {
		return MinTableEnergy
	}
	lo, hi := 0, len(lnR)-1
	if lr >= lnR[hi] {
		return MaxEnergy
	}
	for hi-lo > 1 {
		mid := (lo + hi) / 2
		if lnR[mid] <= lr {
			lo = mid
		} else {
			hi = mid
		}
	}
	f := (lr - lnR[lo]) / (lnR[hi] - lnR[lo])
	return math.Exp(p.lnT0 + (float64(lo)+f)*p.dlnT)
}

// sigmaBound returns an upper bound of the delta-ray cross-section (1/cm)
// for kinetic energies from thi down to thi exp(-lnSpan): the largest
// table value over the grid points bracketing the interval, with a 0.1%
// margin for curvature between points (the cross-section is smooth; its
// relative change over one interval is below 3%).
func (p *Physics) sigmaBound(thi, lnSpan float64) float64 {
	ihi, _ := p.gridPos(thi)
	ilo := max(0, ihi-int(math.Ceil(lnSpan/p.dlnT)))
	var m float64
	for i := ilo; i <= ihi+1; i++ {
		m = math.Max(m, p.sigma[i])
	}
	return m * 1.001
}

func checkEnergy(name string, ekin float64) error {
	return checkRange(name, ekin, MinTableEnergy, MaxEnergy, false)
}

// StoppingPower returns the total mean stopping power (MeV cm^2/g) of the
// medium for the species at kinetic energy ekin (MeV): the Bethe formula
// with the density effect and the spin-1/2 term, the radiative correction
// to ionization, and for Radiative species the radiative losses b(E) E. Valid for ekin in
// [MinTableEnergy, MaxEnergy].
func (p *Physics) StoppingPower(ekin float64) (float64, error) {
	if err := checkEnergy("ekin", ekin); err != nil {
		return 0, err
	}
	return p.continuous(ekin, math.Inf(1)), nil
}

// RestrictedStoppingPower returns the mean loss (MeV cm^2/g) from
// collisions with energy transfer below tcut (MeV, PDG restricted energy
// loss) plus the radiative losses: the continuous loss the transport
// applies when delta rays above tcut are explicit.
func (p *Physics) RestrictedStoppingPower(ekin, tcut float64) (float64, error) {
	if err := checkEnergy("ekin", ekin); err != nil {
		return 0, err
	}
	if err := checkRange("tcut", tcut, 0, math.MaxFloat64, true); err != nil {
		return 0, err
	}
	return p.continuous(ekin, tcut), nil
}

// RadiativeStoppingPower returns the radiative part b(E) E (MeV cm^2/g)
// of the stopping power.
func (p *Physics) RadiativeStoppingPower(ekin float64) (float64, error) {
	if err := checkEnergy("ekin", ekin); err != nil {
		return 0, err
	}
	if !p.sp.Radiative {
		return 0, nil
	}
	return radiative(ekin + p.sp.Mass), nil
}

// CSDARange returns the range (g/cm^2) in the continuous-slowing-down
// approximation, the integral of 1/StoppingPower from 0 to ekin (MeV).
// Divide by the density for cm.
func (p *Physics) CSDARange(ekin float64) (float64, error) {
	if err := checkEnergy("ekin", ekin); err != nil {
		return 0, err
	}
	return p.rangeOf(p.lnRangeAll, ekin), nil
}

// DeltaRayCrossSection returns the macroscopic cross-section (1/cm) for
// producing a delta ray above the configured cut (Config.DeltaCut).
func (p *Physics) DeltaRayCrossSection(ekin float64) (float64, error) {
	if err := checkEnergy("ekin", ekin); err != nil {
		return 0, err
	}
	return p.deltaSigmaOf(p.kin(ekin), p.cfg.DeltaCut), nil
}

// InteractionCrossSection returns the macroscopic hadronic interaction
// cross-section (1/cm) the transport samples, interpolated from the table
// built from Species.Interaction (0 when the species has none).
func (p *Physics) InteractionCrossSection(ekin float64) (float64, error) {
	if err := checkEnergy("ekin", ekin); err != nil {
		return 0, err
	}
	return p.hadronicAt(ekin), nil
}

// hadronicAt interpolates the hadronic cross-section table linearly in
// ln T (0 without a table).
func (p *Physics) hadronicAt(ekin float64) float64 {
	if p.hadronic == nil {
		return 0
	}
	i, f := p.gridPos(math.Max(ekin, MinTableEnergy))
	return p.hadronic[i] + f*(p.hadronic[i+1]-p.hadronic[i])
}

// String names the medium and the main settings.
func (p *Physics) String() string {
	return fmt.Sprintf("%s physics in %s (delta cut %g MeV, low cut %g MeV)", p.sp.Name, p.name, p.cfg.DeltaCut, p.cfg.LowCut)
}
