package material

import (
	"math"
	"testing"
)

func TestWaterElectronDensity(t *testing.T) {
	// Independent calculation: 10 electrons per H2O molecule, molar mass
	// 18.015 g/mol (PDG atomic weights H 1.008, O 15.999), density 1 g/cm^3.
	w := Water()
	want := 10 / (2*1.008 + 15.999) * 6.02214076e23
	if got := w.ElectronDensity(); math.Abs(got/want-1) > 1e-4 {
		t.Errorf("electron density = %g, want %g", got, want)
	}
	var sum float64
	for _, e := range w.Elements {
		sum += e.MassFraction
	}
	if math.Abs(sum-1) > 1e-12 {
		t.Errorf("mass fractions sum to %g", sum)
	}
}

func TestDensityEffectContinuity(t *testing.T) {
	// The PDG parametrisation is continuous at x1 by construction, and the
	// Sternheimer-Peierls C-bar is chosen so that it is nearly continuous at
	// x0 for insulators (delta0 = 0): delta(x0) = 2 ln10 x0 - C + a (x1-x0)^k
	// must be close to 0 (PDG Review, "Passage of particles through matter").
	w := Water()
	x0 := w.SternheimerX0
	d := w.DensityEffect(math.Pow(10, x0+1e-9))
	if math.Abs(d) > 0.05 {
		t.Errorf("delta just above x0 = %g, want ~0", d)
	}
	below := w.DensityEffect(math.Pow(10, w.SternheimerX1-1e-9))
	above := w.DensityEffect(math.Pow(10, w.SternheimerX1+1e-9))
	if math.Abs(below-above) > 1e-6 {
		t.Errorf("delta jumps at x1: %g vs %g", below, above)
	}
	// High-energy limit: delta -> 2 ln(hbar omega_p / I) + 2 ln(beta gamma) - 1
	// with hbar omega_p = 21.469 eV for liquid water (PDG atomic and nuclear
	// properties table), so C-bar = 2 ln(I / hbar omega_p) + 1.
	cbar := 2*math.Log(w.MeanExcitation/21.469e-6) + 1
	if math.Abs(cbar-w.SternheimerCbar) > 0.01 {
		t.Errorf("C-bar from plasma energy = %g, table %g", cbar, w.SternheimerCbar)
	}
}

func TestAtomDensity(t *testing.T) {
	// Liquid water, 1 g/cm^3, 18.015 g/mol: 3.343e22 molecules per cm^3
	// (Avogadro's number / molar mass), so 6.686e22 H and 3.343e22 O.
	w := Water()
	if h, o := w.AtomDensity(1), w.AtomDensity(8); math.Abs(h/6.686e22-1) > 1e-3 || math.Abs(o/3.343e22-1) > 1e-3 {
		t.Errorf("H %.4g, O %.4g per cm3", h, o)
	}
	if _, ok := w.OtherThan(1, 8); ok {
		t.Error("water has an element other than H and O")
	}
	if e, ok := w.OtherThan(1); !ok || e.Z != 8 {
		t.Errorf("OtherThan(1) = %+v, %v", e, ok)
	}
}
