package ring

import (
	"fmt"
	"math"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/ring/internal/profile"
	"github.com/conelight/conelight/sim/phys"
)

// electronTimeSigma and muonTimeSigma are the spread (ns) of the emission time about the
// tabulated mean at the cone point: the lateral and longitudinal spread of
// the shower for electrons, multiple scattering for muons (common
// practice, values from memory).
const (
	electronTimeSigma = 0.7
	muonTimeSigma     = 0.3
)

// farDistance is the distance from the vertex, in units of the light's
// length inside the tank, beyond which the geometry of a sensor's direct
// light (the cosine to the track and the sensor's weight) is computed
// exactly at every other step edge only and interpolated linearly
// between: seen from there both change smoothly along the track, so the
// interpolated sum differs from the exact one by a small fraction of a
// percent (TestFarSensors), for about two thirds of the cost.
const farDistance = 5

// stepGrid is the integration along the track: the step edges (cm from
// the vertex) and their squares, each step's covered fraction with the
// trapezoid's 1/2, and the profile of each step.
type stepGrid struct {
	n             int
	edges, edges2 [nSteps + 1]float64
	frac          [nSteps]float64
	cum, dens     []float64
}

func (g *stepGrid) set(ds, lim float64, n int, cum, dens []float64) {
	g.n, g.cum, g.dens = n, cum, dens
	for k := 0; k <= n; k++ {
		g.edges[k] = math.Min(float64(k)*ds, lim)
		g.edges2[k] = g.edges[k] * g.edges[k]
		if k > 0 {
			g.frac[k-1] = 0.5 * (g.edges[k] - g.edges[k-1]) / ds
		}
	}
}

// direct is the direct light (without the constant cathode-area factor)
// at a sensor at squared distance d2 from the vertex, z along the track,
// dn along its normal, the track's cosine to the normal un; far
// interpolates the geometry at odd edges (see farDistance). This loop is
// the hot path of the fit: the geometry is inlined, one exact edge per
// pass.
func (g *stepGrid) direct(d2, z, dn, un float64, far bool, accT, attT []float64, invAttStep float64) float64 {
	n := g.n
	var mu float64
	// The previous edge: cosine, its uniform-grid cell, weight.
	var cA, rA, wA float64
	var jA int
	for e := -1; e < n; {
		// The next exact edge: the first, then one or (far) two on.
		next := e + 1
		if far && e >= 0 && e+2 <= n {
			next = e + 2
		}
		s := g.edges[next]
		R2 := d2 - 2*s*z + g.edges2[next]
		if R2 < 1 {
			R2 = 1
		}
		invR := 1 / math.Sqrt(R2)
		R := R2 * invR
		c := (z - s) * invR
		ci := (s*un - dn) * invR // incidence cosine on the inward-facing cathode
		var wt float64
		if ci > 0 {
			// acceptance and attenuation tables, linear
			xa := ci * accN
			ka := int(xa)
			var acc float64
			if ka >= accN {
				acc = accT[accN]
			} else {
				acc = accT[ka] + (xa-float64(ka))*(accT[ka+1]-accT[ka])
			}
			xr := R * invAttStep
			kr := int(xr)
			var att float64
			if kr >= len(attT)-1 {
				att = attT[len(attT)-1]
			} else {
				att = attT[kr] + (xr-float64(kr))*(attT[kr+1]-attT[kr])
			}
			wt = ci * invR * invR * acc * att
		}
		j, rc := cosCell(c)
		switch {
		case e < 0:
			// the first edge: nothing to integrate yet
		case next == e+2:
			cm, wm := 0.5*(cA+c), 0.5*(wA+wt)
			jm, rm := cosCell(cm)
			mu += g.stepLight(e, cA, rA, jA, cm, rm, jm, wA+wm)
			mu += g.stepLight(e+1, cm, rm, jm, c, rc, j, wm+wt)
		default:
			mu += g.stepLight(e, cA, rA, jA, c, rc, j, wA+wt)
		}
		cA, rA, jA, wA = c, rc, j, wt
		e = next
	}
	return mu
}

// stepLight is the light of step km seen at the cosines a (cell ja,
// offset ra) and b at its two edges, times the summed weight of the two
// edges: the step's count between the two cosines over their difference.
func (g *stepGrid) stepLight(km int, ca, ra float64, ja int, cb, rb float64, jb int, wsum float64) float64 {
	// No test of wsum > 0: a zero weight gives zero light. Equal cosines
	// (a sensor on the track's line) take the density of their cell.
	d := g.dens[km*uniNC:]
	gk := d[ja]
	if dc := cb - ca; dc > 1e-6 || dc < -1e-6 {
		c := g.cum[km*(uniNC+1):]
		gk = (c[jb] + rb*d[jb] - c[ja] - ra*d[ja]) / dc
	}
	return g.frac[km] * gk * wsum
}

// arrival returns the light-weighted mean arrival time (ns after the
// track's start) and its variance of the direct light at a sensor (the
// geometry as for direct), each step's light arriving from its midpoint
// at s/c + delay(s) + R/v_g; ok is false when no light reaches it.
func (g *stepGrid) arrival(d2, z, dn, un float64, accT, attT []float64, invAttStep float64, delay []float64, binDS, invGroup float64) (mean, variance float64, ok bool) {
	edge := func(s float64) (c, rc, wt, R float64, j int) {
		R2 := math.Max(d2-2*s*z+s*s, 1)
		R = math.Sqrt(R2)
		c = (z - s) / R
		if ci := (s*un - dn) / R; ci > 0 {
			xa := ci * accN
			ka := min(int(xa), accN-1)
			acc := accT[ka] + (xa-float64(ka))*(accT[ka+1]-accT[ka])
			xr := R * invAttStep
			kr := int(xr)
			att := attT[len(attT)-1]
			if kr < len(attT)-1 {
				att = attT[kr] + (xr-float64(kr))*(attT[kr+1]-attT[kr])
			}
			wt = ci / R2 * acc * att
		}
		j, rc = cosCell(c)
		return c, rc, wt, R, j
	}
	var sw, st, st2 float64
	cA, rA, wA, _, jA := edge(g.edges[0])
	for k := 0; k < g.n; k++ {
		cB, rB, wB, _, jB := edge(g.edges[k+1])
		l := g.stepLight(k, cA, rA, jA, cB, rB, jB, wA+wB)
		if l > 0 {
			sm := 0.5 * (g.edges[k] + g.edges[k+1])
			Rm := math.Sqrt(math.Max(d2-2*sm*z+sm*sm, 0))
			kd := min(int(sm/binDS), len(delay)-1)
			t := sm/phys.SpeedOfLight + delay[kd] + Rm*invGroup
			sw += l
			st += l * t
			st2 += l * t * t
		}
		cA, rA, jA, wA = cB, rB, jB, wB
	}
	if !(sw > 0) {
		return 0, 0, false
	}
	mean = st / sw
	return mean, math.Max(st2/sw-mean*mean, 0), true
}

// Predict fills mu with the predicted mean number of photoelectrons
// (direct, scattered and reflected light, without dark noise) and t with
// the predicted direct-light time (ns) at every sensor for hypothesis h
// and track tr. mu and t must have Detector.NumSensors() elements; either
// may be nil.
func (f *Fitter) Predict(h Hypothesis, tr fit.Track, mu, t []float64) error {
	if (mu != nil && len(mu) != f.n) || (t != nil && len(t) != f.n) {
		return fmt.Errorf("ring: Predict: slices of length %d and %d, want %d", len(mu), len(t), f.n)
	}
	if err := f.checkTrack(h, tr); err != nil {
		return err
	}
	w := f.workspace()
	defer f.pool.Put(w)
	tr.Dir = tr.Dir.Normalize()
	w.allTimes = true
	w.predict(h, tr)
	w.allTimes = false
	for i := range mu {
		mu[i] = w.muD[i] + w.muI[i]
	}
	copy(t, w.tDir)
	return nil
}

// predict computes muD, muI, tDir and sgT for a valid track (unit Dir,
// energy in range, vertex inside). It does not allocate.
func (w *workspace) predict(h Hypothesis, tr fit.Track) {
	f := w.f
	r := f.resp
	p := &w.prof
	f.species(h).interpolate(tr.Ekin, p)
	v, u := tr.Vertex, tr.Dir
	lexit := f.det.DistanceAlong(v, u)
	if !(lexit > 0) {
		lexit = 0
	}
	lim := math.Min(p.extent, lexit)
	nsteps := min(int(math.Ceil(lim/p.ds)), nSteps)
	tEnd := math.Min(p.light90, lexit)
	// light-weighted mean emission point inside the tank: the source of
	// the indirect light.
	var sumL, sumLS float64
	for k := 0; k < nsteps; k++ {
		a, b := float64(k)*p.ds, math.Min(float64(k+1)*p.ds, lim)
		l := p.total[k] * (b - a) / p.ds
		sumL += l
		sumLS += l * 0.5 * (a + b)
	}
	sc := 0.0
	if sumL > 0 {
		sc = sumLS / sumL
	}
	cx, cy, cz := v.X+sc*u.X, v.Y+sc*u.Y, v.Z+sc*u.Z
	norm := f.cathodeArea / (2 * math.Pi)
	tan := f.tanCherenkov
	sig0 := f.tts*f.tts + f.trackSigma[h]*f.trackSigma[h]
	// Delay of the emission at the cone point, per table bin.
	binDS := p.extent / profile.NS
	// Step edges along the track, shared by all sensors.
	grid := &w.grid
	grid.set(p.ds, lim, nsteps, p.cum[:], p.dens[:])
	far2 := f.farDistance * math.Max(math.Min(p.light90, lim), 0.6*lim)
	far2 *= far2
	accT, attT := r.acc, r.att
	invAttStep := 1 / r.attStep
	var sumD, sumDR, sumDE, sumG, sumGE float64
	for i := 0; i < f.n; i++ {
		dx, dy, dz := f.px[i]-v.X, f.py[i]-v.Y, f.pz[i]-v.Z
		d2 := dx*dx + dy*dy + dz*dz
		z := dx*u.X + dy*u.Y + dz*u.Z
		dn := dx*f.nx[i] + dy*f.ny[i] + dz*f.nz[i]
		un := u.X*f.nx[i] + u.Y*f.ny[i] + u.Z*f.nz[i]
		mu := grid.direct(d2, z, dn, un, d2 > far2, accT, attT, invAttStep)
		mu *= norm
		w.muD[i] = mu
		// Direct-light time from the point that sees the sensor at the
		// Cherenkov angle.
		b := math.Sqrt(math.Max(d2-z*z, 0))
		sRaw := z - b/tan
		s := min(max(sRaw, 0), tEnd)
		R := math.Sqrt(math.Max(d2-2*s*z+s*s, 0))
		if w.allTimes || w.hitQ[i] >= 0 {
			// The likelihood needs the times of hit sensors only.
			k := min(int(s/binDS), profile.NS-1)
			t := s/phys.SpeedOfLight + p.delay[k] + R*r.invGroup
			sd := R * r.invGroupSD
			v := sig0 + sd*sd
			if h == Electron && sRaw < 0 && mu > 0 {
				// Outside the ring's outer edge no point of the
				// track sees the sensor at the Cherenkov angle. A
				// shower's light there is emitted at larger angles by
				// its particles at depth, not at the start (timed from
				// the start, these sensors pulled an electron's vertex
				// 30 cm forward, the tables' shower forward). Its time
				// is the light-weighted mean arrival over the steps,
				// with their spread, reached over one step beyond the
				// edge so that the prediction stays continuous in the
				// track. A muon emits at the Cherenkov angle from its
				// start, and its light outside the ring (delta rays,
				// scattering) comes early along the track: the start
				// is its time.
				if tm, vm, ok := grid.arrival(d2, z, dn, un, accT, attT, invAttStep, p.delay[:], binDS, r.invGroup); ok {
					a := min(-sRaw/p.ds, 1)
					t += a * (tm - t)
					v += a * vm
				}
			}
			w.tDir[i] = tr.Time + t
			w.sgT[i] = math.Sqrt(v)
		}
		sumD += mu
		sumDR += mu * R
		if mu > 0 {
			// efficiency of the direct light at its incidence
			if cinc := (s*un - dn) / math.Max(R, 1); cinc > 0 {
				sumDE += mu * r.acceptance(cinc) * r.attenuation(R)
			}
		}
		// Isotropic source at the light centroid for the indirect light,
		// with the sensor's acceptance and the attenuation from there.
		ex, ey, ez := f.px[i]-cx, f.py[i]-cy, f.pz[i]-cz
		e2 := ex*ex + ey*ey + ez*ez
		e := math.Sqrt(e2)
		ci := -(ex*f.nx[i] + ey*f.ny[i] + ez*f.nz[i]) / e
		g, ge := 0.0, 0.0
		if ci > 0 { // the sensor faces the source
			g = ci / e2
			ge = g * r.acceptance(ci) * r.attenuation(e)
		}
		w.muI[i] = ge
		sumG += g
		sumGE += ge
	}
	// Indirect light. Of the photons on the mean direct path R, a
	// fraction 1 - exp(-R/L_scat) scatters, on average halfway, having
	// survived absorption exp(-R/(2 L_abs)); those and the photons
	// reflected by the liner, Reflectivity x (1 - coverage) per direct
	// one, are then detected like light from an isotropic source at the
	// centroid: the direct total is scaled by their detection efficiency
	// (acceptance x attenuation) relative to that of the direct light.
	scale := 0.0
	if sumD > 0 && sumGE > 0 && sumDE > 0 {
		rm := sumDR / sumD
		fInd := -math.Expm1(-rm/r.scatLength)*math.Exp(-0.5*rm/r.absLength) + f.reflected
		scale = fInd * sumD * (sumGE / sumG) / (sumDE / sumD) / sumGE
	}
	for i := range w.muI {
		w.muI[i] *= scale
	}
}
