package hadron

import (
	"fmt"
	"math"

	"github.com/conelight/conelight/sim/phys"
)

// millibarn is 1 mb in cm^2.
const millibarn = 1e-27

// Channel is the kind of a hadronic interaction.
type Channel int

// Interaction channels. The values are reported in Truth and never
// renumbered.
const (
	NoChannel Channel = iota
	// Elastic: coherent scattering off the whole nucleus, or elastic
	// scattering off a free proton.
	Elastic
	// QuasiElastic: inelastic scattering off one nucleon of the nucleus,
	// which is knocked out (pi, pi' N) or (N, N' N).
	QuasiElastic
	// ChargeExchange: single charge exchange, the pion leaves as a pi0
	// (on a nucleon of oxygen or, for pi-, on a free proton).
	ChargeExchange
	// Absorption: the pion is absorbed by a nucleon pair, which is
	// emitted (no pion leaves).
	Absorption
	numChannels
)

var channelNames = [numChannels]string{"none", "elastic", "quasi-elastic", "charge-exchange", "absorption"}

func (c Channel) String() string {
	if c >= 0 && c < numChannels {
		return channelNames[c]
	}
	return fmt.Sprintf("Channel(%d)", int(c))
}

// pionOxygen is the pi+- 16O cross-section per channel (mb) against pion
// kinetic energy (MeV): elastic, quasi-elastic (inelastic), single charge
// exchange, absorption. The values follow the shape and size of the
// measurements of Ashery et al., Phys. Rev. C 23 (1981) 2173 (pi+ and pi-
// on C, O and heavier nuclei, 125-315 MeV) and their extrapolation to 50
// and 1000 MeV; VALUES FROM MEMORY (the tables could not be looked up),
// good to perhaps 20%. pi+ and pi- are given the same values (16O has
// N = Z; the Coulomb difference, ~10% at 125 MeV, is neglected). Pion
// production above ~400 MeV is counted as quasi-elastic.
var pionOxygen = [...]struct{ t, el, qe, cx, abs float64 }{
	{10, 20, 5, 2, 60},
	{50, 80, 40, 15, 130},
	{85, 170, 120, 30, 180},
	{125, 230, 200, 45, 220},
	{165, 240, 250, 55, 220},
	{205, 210, 255, 55, 180},
	{245, 170, 250, 55, 140},
	{315, 130, 230, 45, 90},
	{500, 110, 230, 35, 40},
	{1000, 100, 220, 20, 20},
	{1e4, 100, 220, 20, 20},
}

// InterpLog interpolates the table (xs, ys) linearly in ln x at x,
// holding the end values outside it; xs must be increasing and positive.
// It is the interpolation of every cross-section table of sim/hadron and
// sim/neutron.
func InterpLog(xs, ys []float64, x float64) float64 {
	n := len(xs)
	switch {
	case x <= xs[0]:
		return ys[0]
	case x >= xs[n-1]:
		return ys[n-1]
	}
	i := 1
	for xs[i] < x {
		i++
	}
	f := math.Log(x/xs[i-1]) / math.Log(xs[i]/xs[i-1])
	return ys[i-1] + f*(ys[i]-ys[i-1])
}

// pionOxygenAt interpolates the pionOxygen rows linearly in ln T,
// clamped at the ends.
func pionOxygenAt(t float64) [numChannels]float64 {
	var out [numChannels]float64
	n := len(pionOxygen)
	if t <= pionOxygen[0].t {
		t = pionOxygen[0].t
	}
	if t >= pionOxygen[n-1].t {
		t = pionOxygen[n-1].t
	}
	i := 1
	for i < n-1 && pionOxygen[i].t < t {
		i++
	}
	lo, hi := pionOxygen[i-1], pionOxygen[i]
	f := math.Log(t/lo.t) / math.Log(hi.t/lo.t)
	out[Elastic] = lo.el + f*(hi.el-lo.el)
	out[QuasiElastic] = lo.qe + f*(hi.qe-lo.qe)
	out[ChargeExchange] = lo.cx + f*(hi.cx-lo.cx)
	out[Absorption] = lo.abs + f*(hi.abs-lo.abs)
	return out
}

// PionOxygen returns the pi-16O cross-sections (mb) of the four channels
// at pion kinetic energy t (MeV), indexed by Channel (index 0 unused).
func PionOxygen(t float64) [numChannels]float64 { return pionOxygenAt(t) }

// Delta(1232) Breit-Wigner mass and width, 1232 and 117 MeV (PDG Review
// particle listings; from memory).
const (
	deltaMass  = 1232.0
	deltaWidth = 117.0
)

// piNMomentum returns the pion-nucleon centre-of-mass momentum (MeV/c)
// for a pion of kinetic energy t on a nucleon at rest, and the invariant
// mass W.
func piNMomentum(t float64) (q, w float64) {
	e := t + phys.PionMass
	m := phys.ProtonMass
	w = math.Sqrt(phys.PionMass*phys.PionMass + m*m + 2*e*m)
	return phys.TwoBodyMomentum(w, phys.PionMass, m), w
}

// deltaResonance returns the spin-3/2 isospin-3/2 resonant cross-section
// (mb) at invariant mass w and cm momentum q:
//
//	sigma = (8 pi / q^2) (Gamma^2/4) / ((W - M)^2 + Gamma^2/4),
//	Gamma(q) = Gamma_0 (q/q_0)^3 M/W,
//
// the Breit-Wigner form with a p-wave width (spin factor (2J+1)/2 = 2).
// Its peak, 190 mb at T = 190 MeV, is the pi+ p total cross-section
// there (PDG Review, pi+ p total cross-section plot, about 200 mb; from
// memory).
func deltaResonance(w, q float64) float64 {
	q0 := phys.TwoBodyMomentum(deltaMass, phys.PionMass, phys.ProtonMass)
	g := deltaWidth * math.Pow(q/q0, 3) * deltaMass / w
	hc := phys.HbarC // MeV fm
	sigFm2 := 8 * math.Pi * hc * hc / (q * q) * g * g / 4 / ((w-deltaMass)*(w-deltaMass) + g*g/4)
	return sigFm2 * 10 // fm^2 -> mb
}

// Free pion-proton cross-sections (mb) at pion kinetic energy t: the
// Delta(1232) with isospin Clebsch-Gordan weights (pi+ p: elastic 1;
// pi- p: elastic 1/9, charge exchange 2/9) plus a flat non-resonant
// background (pi+ p 5 mb elastic; pi- p 10 mb elastic, 5 mb charge
// exchange; rough, from memory, standing in for the I = 1/2 partial waves
// and the higher resonances above ~500 MeV). Inelastic pion production
// above ~400 MeV is not modelled separately.
func piProton(t float64, negative bool) (el, cx float64) {
	q, w := piNMomentum(t)
	r := deltaResonance(w, q)
	if !negative {
		return r + 5, 0
	}
	return r/9 + 10, 2*r/9 + 5
}

// protonOxygenReaction is the p + 16O total reaction (non-elastic)
// cross-section (mb) against proton kinetic energy (MeV), following the
// compilation of Carlson, Atomic Data and Nuclear Data Tables 63 (1996)
// 93; VALUES FROM MEMORY. Neutrons on 16O above 20 MeV are given the same
// non-elastic cross-section.
var protonOxygenReaction = [2][10]float64{
	{10, 20, 30, 50, 100, 200, 500, 1000, 2000, 1e4},
	{400, 480, 450, 390, 320, 290, 300, 330, 340, 340},
}

// ProtonOxygenReaction returns the p-16O reaction cross-section (mb) at
// proton kinetic energy t (MeV).
func ProtonOxygenReaction(t float64) float64 {
	return InterpLog(protonOxygenReaction[0][:], protonOxygenReaction[1][:], t)
}

// protonProtonElastic is the nuclear p-p elastic cross-section (mb)
// against kinetic energy (MeV), from memory of the PDG Review's
// nucleon-nucleon plots: falls from ~60 mb at 50 MeV to the ~24 mb
// plateau; the inelastic p-p cross-section above 300 MeV is counted as
// elastic.
var protonProtonElastic = [2][6]float64{
	{50, 100, 200, 500, 1000, 1e4},
	{60, 33, 24, 24, 47, 40},
}

// ProtonProtonElastic returns the p-p cross-section (mb) used for protons
// on the hydrogen of water at kinetic energy t (MeV).
func ProtonProtonElastic(t float64) float64 {
	return InterpLog(protonProtonElastic[0][:], protonProtonElastic[1][:], t)
}
