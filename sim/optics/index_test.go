package optics

import (
	"math"
	"testing"
)

// airIndex returns the refractive index of dry air at 101325 Pa and tempC
// from the dispersion formula for standard air (15 C) of Edlen, Metrologia
// 2 (1966) 71, eq. 1, scaled to tempC as an ideal gas (n-1 proportional to
// density). Handbook water indices are relative to such air.
func airIndex(lambdaNM, tempC float64) float64 {
	s2 := math.Pow(1000/lambdaNM, 2) // sigma^2 in 1/um^2
	nm1 := (8342.13 + 2406030/(130-s2) + 15997/(38.9-s2)) * 1e-8
	return 1 + nm1*(273.15+15)/(273.15+tempC)
}

func TestRefractiveIndexHandbook(t *testing.T) {
	cases := []struct {
		lambda, temp, want, tol float64
		src                     string
	}{
		// CRC Handbook of Chemistry and Physics, "Index of refraction of
		// water": n_D = 1.3330 at 20 C (relative to air); tolerance 2e-4
		// as the handbook value is given to 4 decimals.
		{589.3, 20, 1.3330, 2e-4, "CRC Handbook, n_D at 20 C"},
		// CRC Handbook, same table, other lines at 20 C (from memory, to
		// 5 decimals; tolerance 1e-4).
		{404.66, 20, 1.34275, 1e-4, "CRC Handbook Hg h-line 20 C, from memory"},
		{486.13, 20, 1.33712, 1e-4, "CRC Handbook H F-line 20 C, from memory"},
		{656.28, 20, 1.33110, 1e-4, "CRC Handbook H C-line 20 C, from memory"},
		{589.3, 25, 1.33250, 1e-4, "CRC Handbook n_D at 25 C, from memory"},
	}
	for _, c := range cases {
		n, err := RefractiveIndex(c.lambda, c.temp)
		if err != nil {
			t.Fatal(err)
		}
		relAir := n / airIndex(c.lambda, c.temp)
		if math.Abs(relAir-c.want) > c.tol {
			t.Errorf("n(%g nm, %g C)/n_air = %.5f, want %.5f +- %g (%s)", c.lambda, c.temp, relAir, c.want, c.tol, c.src)
		}
	}
	// The index falls with temperature: dn/dT about -1e-4 /K near 20 C
	// (CRC Handbook n_D 20 C vs 25 C above, from memory).
	n20, _ := RefractiveIndex(589.3, 20)
	n30, _ := RefractiveIndex(589.3, 30)
	if d := (n30 - n20) / 10; !(d < -0.5e-4 && d > -2e-4) {
		t.Errorf("dn/dT = %g /K, want about -1e-4", d)
	}
}

func TestKellDensity(t *testing.T) {
	// Tanaka, Girard, Davis, Peuto, Bignell, Metrologia 38 (2001) 301,
	// eq. 1 (SMOW, air-free, 0..40 C, ITS-90): an independent fit. Kell
	// (1975) is on the older density scale, a few ppm lower; allow 5e-3
	// kg/m^3 (5 ppm).
	tanaka := func(tc float64) float64 {
		const a1, a2, a3, a4, a5 = -3.983035, 301.797, 522528.9, 69.34881, 999.974950
		return a5 * (1 - (tc+a1)*(tc+a1)*(tc+a2)/(a3*(tc+a4)))
	}
	for tc := 0.0; tc <= 40; tc += 2.5 {
		rho, err := WaterDensity(tc)
		if err != nil {
			t.Fatal(err)
		}
		if d := rho - tanaka(tc); math.Abs(d) > 5e-3 {
			t.Errorf("Kell density at %g C = %.4f, Tanaka %.4f (diff %g)", tc, rho, tanaka(tc), d)
		}
	}
	// Boiling point at 0.1 MPa: 958.35 kg/m^3 at 100 C (CRC Handbook,
	// density of water table, from memory).
	if rho, _ := WaterDensity(100); math.Abs(rho-958.35) > 0.05 {
		t.Errorf("density at 100 C = %.3f, want 958.35", rho)
	}
}

func TestGroupIndexDerivative(t *testing.T) {
	// The analytic lambda dn/dlambda against a central difference of
	// RefractiveIndex. The truncation error of a central difference with
	// step h goes as h^2, so |D(h) - D(h/2)| bounds it (times 4/3);
	// roundoff is below 1e-12.
	for _, tc := range []float64{0, 20, 80} {
		for _, l := range []float64{201, 250, 300, 400, 550, 700, 1000, 1099} {
			ng, err := GroupIndex(l, tc)
			if err != nil {
				t.Fatal(err)
			}
			n, _ := RefractiveIndex(l, tc)
			diff := func(h float64) float64 {
				np, _ := RefractiveIndex(l+h, tc)
				nm, _ := RefractiveIndex(l-h, tc)
				return n - l*(np-nm)/(2*h)
			}
			d1, d2 := diff(0.5), diff(0.25)
			tol := 4.0/3*math.Abs(d1-d2) + 1e-11
			if math.Abs(ng-d2) > tol {
				t.Errorf("n_g(%g nm, %g C): analytic %.10f, difference %.10f (tol %g)", l, tc, ng, d2, tol)
			}
		}
	}
}

func TestGroupIndexBlue(t *testing.T) {
	// Normal dispersion: n_g exceeds n by a few percent in the blue
	// (common practice for water), by less in the red.
	n4, _ := RefractiveIndex(400, 20)
	ng4, _ := GroupIndex(400, 20)
	n6, _ := RefractiveIndex(600, 20)
	ng6, _ := GroupIndex(600, 20)
	if r := ng4/n4 - 1; !(r > 0.02 && r < 0.05) {
		t.Errorf("n_g/n - 1 at 400 nm = %g, want a few percent", r)
	}
	if !(ng6/n6 < ng4/n4 && ng6 > n6) {
		t.Errorf("group excess at 600 nm (%g) should be positive and below that at 400 nm (%g)", ng6/n6-1, ng4/n4-1)
	}
	// Light in water travels at about 3/4 c (common practice).
	if v := 1 / n4; math.Abs(v-0.75) > 0.01 {
		t.Errorf("phase velocity at 400 nm = %g c, want about 0.75 c", v)
	}
}

func TestIndexBadInput(t *testing.T) {
	for _, c := range [][2]float64{{150, 20}, {1200, 20}, {math.NaN(), 20}, {400, -5}, {400, 120}, {400, math.Inf(1)}, {400, math.NaN()}} {
		if _, err := RefractiveIndex(c[0], c[1]); err == nil {
			t.Errorf("RefractiveIndex(%g, %g) gave no error", c[0], c[1])
		}
		if _, err := GroupIndex(c[0], c[1]); err == nil {
			t.Errorf("GroupIndex(%g, %g) gave no error", c[0], c[1])
		}
	}
	if _, err := WaterDensity(-1); err == nil {
		t.Error("WaterDensity(-1) gave no error")
	}
}
