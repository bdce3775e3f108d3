package cherenkov

import (
	"math"
	"math/rand/v2"
)

// poisson draws a Poisson variate of mean mu >= 0 without allocation.
// Below mu = 10 it multiplies uniforms (Knuth, TAOCP vol. 2, 3.4.1);
// above, it uses the transformed rejection method PTRS of Hoermann,
// Insurance: Math. Econ. 12 (1993) 39, exact for any mu.
func poisson(rng *rand.Rand, mu float64) int {
	if mu <= 0 {
		return 0
	}
	if mu < 10 {
		limit := math.Exp(-mu)
		k := 0
		for p := rng.Float64(); p > limit; p *= rng.Float64() {
			k++
		}
		return k
	}
	smu := math.Sqrt(mu)
	b := 0.931 + 2.53*smu
	a := -0.059 + 0.02483*b
	invAlpha := 1.1239 + 1.1328/(b-3.4)
	vr := 0.9277 - 3.6224/(b-2)
	logMu := math.Log(mu)
	for {
		u := rng.Float64() - 0.5
		v := rng.Float64()
		us := 0.5 - math.Abs(u)
		k := math.Floor((2*a/us+b)*u + mu + 0.43)
		if us >= 0.07 && v <= vr {
			return int(k)
		}
		if k < 0 || (us < 0.013 && v > us) {
			continue
		}
		lg, _ := math.Lgamma(k + 1)
		if math.Log(v)+math.Log(invAlpha)-math.Log(a/(us*us)+b) <= -mu+k*logMu-lg {
			return int(k)
		}
	}
}
