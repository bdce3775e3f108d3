package em

import (
	"math"

	"github.com/conelight/conelight/sim/phys"
)

// Bremsstrahlung and pair production on an atom after Tsai, Rev. Mod.
// Phys. 46 (1974) 815: the nuclear term Z^2 and the atomic-electron term Z
// (the "Z(Z + xi)" of the complete-screening limit, xi = L'rad/(Lrad - f),
// which is how triplet production and electron-electron bremsstrahlung
// enter), each with its screening functions.

// atom holds what the Tsai cross-sections need of one element, and its
// number of atoms per cm^3.
type atom struct {
	z, perCm3      float64
	lrad, lradP, f float64 // Tsai's Lrad, L'rad and the Coulomb correction f(Z)
	z13, z23       float64 // Z^(1/3), Z^(2/3)
}

func newAtom(z int, a, massFraction, density float64) atom {
	zf := float64(z)
	at := atom{
		z:      zf,
		perCm3: density * massFraction * phys.Avogadro / a,
		f:      coulombCorrection(zf),
		z13:    math.Cbrt(zf),
	}
	at.z23 = at.z13 * at.z13
	// Tsai 1974, Table B.2: Lrad and L'rad from Hartree-Fock form factors
	// for Z <= 4; the Thomas-Fermi values for Z >= 5.
	switch z {
	case 1:
		at.lrad, at.lradP = 5.31, 6.144
	case 2:
		at.lrad, at.lradP = 4.79, 5.621
	case 3:
		at.lrad, at.lradP = 4.74, 5.805
	case 4:
		at.lrad, at.lradP = 4.71, 5.924
	default:
		at.lrad = math.Log(184.15 / at.z13)
		at.lradP = math.Log(1194 / at.z23)
	}
	return at
}

// coulombCorrection is f(Z) of Davies, Bethe and Maximon, in the series
// form of Tsai 1974 eq. (3.3) (also PDG Review, "Passage of particles
// through matter", radiation length).
func coulombCorrection(z float64) float64 {
	a2 := z * phys.FineStructure * z * phys.FineStructure
	return a2 * (1/(1+a2) + 0.20206 - 0.0369*a2 + 0.0083*a2*a2 - 0.002*a2*a2*a2)
}

// Tsai's fits to the Thomas-Fermi screening functions (Tsai 1974, eqs.
// 3.38-3.41): phi for the nucleus, psi for the atomic electrons, as
// functions of the screening variables gs = 100 m k/(E E' Z^(1/3)) and
// es = 100 m k/(E E' Z^(2/3)). phi1(0) = 4 ln 184.15, psi1(0) = 4 ln 1194.
func phi1(gs float64) float64 {
	u := 0.55846 * gs
	return 20.863 - 2*math.Log1p(u*u) - 4*(1-0.6*math.Exp(-0.9*gs)-0.4*math.Exp(-1.5*gs))
}

func phi12(gs float64) float64 { return 2.0 / 3 / (1 + gs*(6.5+6*gs)) } // phi1 - phi2

func psi1(es float64) float64 {
	u := 3.621 * es
	return 28.340 - 2*math.Log1p(u*u) - 4*(1-0.7*math.Exp(-8*es)-0.3*math.Exp(-29.2*es))
}

func psi12(es float64) float64 { return 2.0 / 3 / (1 + es*(40+400*es)) } // psi1 - psi2

const (
	phi10 = 20.863 // phi1(0)
	psi10 = 28.340 // psi1(0)
)

// screened returns Tsai's two screened brackets for one atom at screening
// parameter s = 100 m k/(E E'):
//
//	A = Z^2 (Lrad - f + [phi1(gs) - phi1(0)]/4) + Z (L'rad + [psi1(es) - psi1(0)]/4),
//	D = Z^2 (phi1 - phi2) + Z (psi1 - psi2),
//
// which are Tsai's Z^2 (phi1/4 - ln Z/3 - f) + Z (psi1/4 - 2 ln Z/3) and
// its (phi1 - phi2) term, written with the element's own complete-screening
// constants so that the light elements keep their Hartree-Fock Lrad, L'rad
// (their screening shape is taken from the Thomas-Fermi fit: an
// approximation for hydrogen, which carries 6% of the bremsstrahlung of
// water). Each of the nuclear and electron parts is held at zero or above:
// the high-energy formula turns negative only near the kinematic limits,
// where it does not hold anyway.
func (at *atom) screened(s float64) (a, d float64) {
	gs, es := s/at.z13, s/at.z23
	z2 := at.z * at.z
	an := math.Max(0, at.lrad-at.f+(phi1(gs)-phi10)/4)
	ae := math.Max(0, at.lradP+(psi1(es)-psi10)/4)
	return z2*an + at.z*ae, z2*phi12(gs) + at.z*psi12(es)
}

// bremsShape returns k dsigma/dk per cm, in units of 4 alpha r_e^2, for
// an electron of total energy e radiating a photon of energy k (Tsai 1974
// eq. 3.9, summed over atoms):
//
//	k dsigma/dk = 4 alpha r_e^2 Sum n_i {(4/3 - 4/3 y + y^2) A_i + (1-y) D_i/6},  y = k/e.
func bremsShape(atoms []atom, e, k float64) float64 {
	const m = phys.ElectronMass
	ep := e - k
	if ep < m {
		return 0
	}
	y := k / e
	s := 100 * m * k / (e * ep)
	w := 4.0/3 - 4.0/3*y + y*y
	var sum float64
	for i := range atoms {
		a, d := atoms[i].screened(s)
		sum += atoms[i].perCm3 * (w*a + (1-y)*d/6)
	}
	return sum
}

// bremsShapeMax bounds bremsShape for all e, k: y = 0 and complete
// screening (A_i at its largest, D_i = 2/3 (Z^2 + Z)).
func bremsShapeMax(atoms []atom) float64 {
	var sum float64
	for i := range atoms {
		a, d := atoms[i].screened(0)
		sum += atoms[i].perCm3 * (4.0/3*a + d/6)
	}
	return sum
}

// pairShape returns dsigma/dx per cm, in units of 4 alpha r_e^2, for a
// photon of energy k making a pair with a fraction x of k as the total
// energy of one lepton (Tsai 1974, pair production, with the same
// screening functions at s = 100 m/(k x (1-x))):
//
//	dsigma/dx = 4 alpha r_e^2 Sum n_i {[x^2 + (1-x)^2] A_i + (2/3) x (1-x) (A_i - D_i/4)}.
//
// The atomic-electron (triplet) part is dropped below its threshold 4m.
func pairShape(atoms []atom, k, x float64, withElectrons bool) (nuclear, electron float64) {
	const m = phys.ElectronMass
	s := 100 * m / (k * x * (1 - x))
	w1 := x*x + (1-x)*(1-x)
	w2 := 2.0 / 3 * x * (1 - x)
	triplet := withElectrons && k > 4*m
	for i := range atoms {
		at := &atoms[i]
		gs, es := s/at.z13, s/at.z23
		z2 := at.z * at.z
		an := at.lrad - at.f + (phi1(gs)-phi10)/4
		nuclear += at.perCm3 * z2 * math.Max(0, w1*an+w2*(an-phi12(gs)/4))
		if triplet {
			ae := at.lradP + (psi1(es)-psi10)/4
			electron += at.perCm3 * at.z * math.Max(0, w1*ae+w2*(ae-psi12(es)/4))
		}
	}
	return nuclear, electron
}

// alphaRe2x4 is 4 alpha r_e^2 in cm^2.
const alphaRe2x4 = 4 * phys.FineStructure * phys.ClassicalElectronRadius * phys.ClassicalElectronRadius
