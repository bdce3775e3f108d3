package material

import "math"

// Medium holds the bulk properties of a homogeneous medium.
type Medium struct {
	Name    string
	Density float64 // g/cm^3
	ZOverA  float64 // <Z/A>, mol/g
	// MeanExcitation is I in MeV.
	MeanExcitation float64
	// Sternheimer density-effect parameters (PDG notation).
	SternheimerA, SternheimerK, SternheimerX0, SternheimerX1, SternheimerCbar, SternheimerDelta0 float64
	// RadiationLength is X0 in cm (not g/cm^2).
	RadiationLength float64
	// Elements by mass fraction, for cross-sections that need Z.
	Elements []Element
}

// Element is one constituent of a compound.
type Element struct {
	Symbol       string
	Z            int
	A            float64 // g/mol
	MassFraction float64
}

// Water returns liquid water as tabulated in the PDG "Atomic and nuclear
// properties of materials" table for water (liquid): <Z/A> = 0.55509,
// density 1.000 g/cm^3, X0 = 36.08 g/cm^2, Sternheimer a = 0.09116,
// k = 3.4773, x0 = 0.2400, x1 = 2.8004, -C = 3.5017, delta0 = 0.
// Atomic weights from the same tables (H 1.008, O 15.999).
//
// The mean excitation energy is I = 75.0 eV, the value the Sternheimer
// parameters above were fitted with (C-bar = 2 ln(I / hbar omega_p) + 1
// with hbar omega_p = 21.469 eV gives 3.5017 only for 75.0 eV) and the
// value used by the Groom-Mokhov-Striganov muon tables (ADNDT 78 (2001)
// 183) and NIST ESTAR that conelight is checked against. The PDG table's
// newer I = 79.7 eV would shift dE/dx by about 1% at minimum ionization.
func Water() Medium {
	const aH, aO = 1.008, 15.999
	fH := 2 * aH / (2*aH + aO)
	return Medium{
		Name:              "water (liquid)",
		Density:           1.000,
		ZOverA:            0.55509,
		MeanExcitation:    75.0e-6,
		SternheimerA:      0.09116,
		SternheimerK:      3.4773,
		SternheimerX0:     0.2400,
		SternheimerX1:     2.8004,
		SternheimerCbar:   3.5017,
		SternheimerDelta0: 0,
		RadiationLength:   36.08 / 1.000,
		Elements: []Element{
			{Symbol: "H", Z: 1, A: aH, MassFraction: fH},
			{Symbol: "O", Z: 8, A: aO, MassFraction: 1 - fH},
		},
	}
}

// ElectronDensity returns electrons per cm^3.
func (m Medium) ElectronDensity() float64 {
	const avogadro = 6.02214076e23
	return m.Density * m.ZOverA * avogadro
}

// DensityEffect returns the Sternheimer density-effect correction delta
// for a particle with beta*gamma = bg (PDG Review, "Passage of particles
// through matter", eq. for delta(beta gamma) with x = log10(beta gamma)).
func (m Medium) DensityEffect(bg float64) float64 {
	if bg <= 0 {
		return 0
	}
	x := math.Log10(bg)
	const twoLn10 = 2 * math.Ln10
	switch {
	case x >= m.SternheimerX1:
		return twoLn10*x - m.SternheimerCbar
	case x >= m.SternheimerX0:
		return twoLn10*x - m.SternheimerCbar + m.SternheimerA*math.Pow(m.SternheimerX1-x, m.SternheimerK)
	default:
		return m.SternheimerDelta0 * math.Pow(10, 2*(x-m.SternheimerX0))
	}
}

// AtomDensity returns the number of atoms of atomic number z per cm^3
// (0 if the medium has none).
func (m Medium) AtomDensity(z int) float64 {
	const avogadro = 6.02214076e23
	var n float64
	for _, e := range m.Elements {
		if e.Z == z {
			n += m.Density * e.MassFraction * avogadro / e.A
		}
	}
	return n
}

// OtherThan returns the first element whose atomic number is not among
// zs, and whether there is one.
func (m Medium) OtherThan(zs ...int) (Element, bool) {
	for _, e := range m.Elements {
		known := false
		for _, z := range zs {
			known = known || e.Z == z
		}
		if !known {
			return e, true
		}
	}
	return Element{}, false
}
