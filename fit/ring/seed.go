package ring

import (
	"math"

	"github.com/golang/geo/r3"
	"gonum.org/v1/gonum/optimize"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/sim/phys"
)

// gridHits bounds the hits the seeds' coarse searches (the point seed's
// grid, the direction spiral) evaluate.
const gridHits = 300

// spreadHits returns at most n of the loaded event's hit sensors, evenly
// spread over the list (all of them when there are no more than n).
func (w *workspace) spreadHits(n int) []int {
	if len(w.hits) <= n {
		return w.hits
	}
	sub := make([]int, n)
	for k := range sub {
		sub[k] = w.hits[k*len(w.hits)/n]
	}
	return sub
}

// goodChargeCap caps the charge weight of a hit in the point-fit goodness:
// weighting by charge lets a bright ring outweigh a dimmer burst of light
// in the same readout (a muon's decay electron soon after it), and the
// cap keeps a few bright sensors from deciding alone.
const goodChargeCap = 3

// pointSeed is the vertex and time of a point source that best explains
// the hit times: the goodness sum_i min(q_i, 3) exp(-(t_i - t0 - R_i/v_g)^2 / 2 sigma^2)
// is maximized first on a grid over the tank and then by Nelder-Mead.
// The point found lies along the track, near where most of the light comes
// from; the track fits move it back to the start.
func (w *workspace) pointSeed() (r3.Vector, float64) {
	f := w.f
	sigma := math.Hypot(f.tts, 1.5)
	good := func(hits []int, v r3.Vector, t0 float64) float64 {
		var g float64
		for _, i := range hits {
			r := (w.arrival(i, v) - t0) / sigma
			g += math.Min(w.hitQ[i], goodChargeCap) * math.Exp(-0.5*r*r)
		}
		return g
	}
	res := make([]float64, len(w.hits))
	var counts []float64
	// bestT is the start time of v that puts the most weight (capped
	// charge, as in good) within one window of width 2 sigma: the mean of
	// the residuals in the fullest pair of adjacent sigma-wide bins, less
	// half a sigma for the early bias of first hits. Binning instead of
	// sorting keeps the grid search linear in the hits.
	bestT := func(hits []int, v r3.Vector) float64 {
		res := res[:len(hits)]
		lo, hi := math.Inf(1), math.Inf(-1)
		for k, i := range hits {
			r := w.arrival(i, v)
			res[k] = r
			lo, hi = math.Min(lo, r), math.Max(hi, r)
		}
		nb := int((hi-lo)/sigma) + 2
		if cap(counts) < nb {
			counts = make([]float64, nb)
		}
		counts = counts[:nb]
		clear(counts)
		for k, r := range res {
			counts[int((r-lo)/sigma)] += math.Min(w.hitQ[hits[k]], goodChargeCap)
		}
		best, bb := -1.0, 0
		for b := 0; b+1 < nb; b++ {
			if c := counts[b] + counts[b+1]; c > best {
				best, bb = c, b
			}
		}
		a, e := lo+float64(bb)*sigma, lo+float64(bb+2)*sigma
		var s float64
		var m int
		for _, r := range res {
			if r >= a && r < e {
				s += r
				m++
			}
		}
		return s/float64(m) - 0.5*sigma
	}
	// The grid needs only a rough vertex: it uses at most gridHits of the
	// hits, evenly spread over the list; Nelder-Mead then uses them all.
	grid := w.spreadHits(gridHits)
	R, H := f.tankRadius, f.tankHalfZ
	step := math.Max(math.Max(R, H)/6, 50)
	var bv r3.Vector
	bt, bg := 0.0, math.Inf(-1)
	for x := -R + step/2; x < R; x += step {
		for y := -R + step/2; y < R; y += step {
			if x*x+y*y > R*R {
				continue
			}
			for z := -H + step/2; z < H; z += step {
				v := r3.Vector{X: x, Y: y, Z: z}
				t0 := bestT(grid, v)
				if g := good(grid, v, t0); g > bg {
					bv, bt, bg = v, t0, g
				}
			}
		}
	}
	bt = bestT(w.hits, bv)
	bg = good(w.hits, bv, bt)
	p := optimize.Problem{Func: func(x []float64) float64 {
		v := r3.Vector{X: x[0] * 10, Y: x[1] * 10, Z: x[2] * 10}
		pen := 0.0
		if d := f.det.DistanceToWall(v); d < 0 {
			pen = d * d
		}
		return -good(w.hits, v, x[3]) + pen
	}}
	r, _ := optimize.Minimize(p, []float64{bv.X / 10, bv.Y / 10, bv.Z / 10, bt},
		&optimize.Settings{FuncEvaluations: 600, Converger: &optimize.FunctionConverge{Absolute: 1e-3, Iterations: 30}},
		&optimize.NelderMead{SimplexSize: step / 20})
	// A run that stopped early still holds its best point.
	if r != nil {
		v := r3.Vector{X: r.X[0] * 10, Y: r.X[1] * 10, Z: r.X[2] * 10}
		if f.det.DistanceToWall(v) > 0 && -r.F >= bg {
			bv, bt = v, r.X[3]
		}
	}
	return bv, bt
}

// directionSeed finds the ring axis from vertex v: the direction about
// which the charge of the hits is most concentrated at the Cherenkov
// angle, searched over a spiral of directions covering the sphere and
// refined around the best one.
func (w *workspace) directionSeed(v r3.Vector) r3.Vector {
	score := w.ringScore(v, w.hits)
	// The spiral needs only a rough axis: it scores at most gridHits of
	// the hits, evenly spread; the refinement scores them all.
	coarse := score
	if len(w.hits) > gridHits {
		coarse = w.ringScore(v, w.spreadHits(gridHits))
	}
	const n = 2000
	var best r3.Vector
	bs := math.Inf(-1)
	golden := math.Pi * (3 - math.Sqrt(5))
	for k := 0; k < n; k++ {
		z := 1 - (float64(k)+0.5)*2/n
		r := math.Sqrt(1 - z*z)
		phi := golden * float64(k)
		u := r3.Vector{X: r * math.Cos(phi), Y: r * math.Sin(phi), Z: z}
		if s := coarse(u, 0.06); s > bs {
			best, bs = u, s
		}
	}
	best = w.refine(best, score)
	// The charge centroid seen from v is a second candidate: the spiral's
	// best can be a chance alignment when v is far from the true start
	// (the point fit of a high-energy shower lands near its maximum).
	var c r3.Vector
	for _, i := range w.hits {
		d := r3.Vector{X: w.f.px[i] - v.X, Y: w.f.py[i] - v.Y, Z: w.f.pz[i] - v.Z}.Normalize()
		c = c.Add(d.Mul(math.Min(w.hitQ[i], 10)))
	}
	if c.Norm() > 0 {
		alt := w.refine(c.Normalize(), score)
		if score(alt, 0.03) > score(best, 0.03) {
			best = alt
		}
	}
	return best
}

// refineDirection re-aims the ring axis from a new vertex v, starting at u.
func (w *workspace) refineDirection(v, u r3.Vector) r3.Vector {
	score := w.ringScore(v, w.hits)
	return w.refine(u, score)
}

// refine searches rings of shrinking opening about the best direction.
func (w *workspace) refine(best r3.Vector, score func(r3.Vector, float64) float64) r3.Vector {
	bs := score(best, 0.03)
	for _, ang := range []float64{0.06, 0.03, 0.015, 0.007, 0.003} {
		c := best
		for j := 0; j < 12; j++ {
			u := phys.Deflect(c, math.Cos(ang), float64(j)*math.Pi/6)
			if s := score(u, 0.03); s > bs {
				best, bs = u, s
			}
		}
	}
	return best
}

// ringScore returns the score of a ring axis seen from v: the hit charge
// (capped at 10 pe) within a Gaussian band of the given width in cosine
// about the Cherenkov angle.
func (w *workspace) ringScore(v r3.Vector, hits []int) func(r3.Vector, float64) float64 {
	f := w.f
	cosC := 1 / f.resp.index
	type hv struct {
		u r3.Vector
		q float64
	}
	hs := make([]hv, 0, len(hits))
	for _, i := range hits {
		d := r3.Vector{X: f.px[i] - v.X, Y: f.py[i] - v.Y, Z: f.pz[i] - v.Z}.Normalize()
		hs = append(hs, hv{d, math.Min(w.hitQ[i], 10)})
	}
	return func(u r3.Vector, width float64) float64 {
		var s float64
		for _, h := range hs {
			x := (h.u.Dot(u) - cosC) / width
			s += h.q * math.Exp(-0.5*x*x)
		}
		return s
	}
}

// trackSeed turns the point seed into a track seed for hypothesis h:
// the energy that matches the total charge and the start point moved back
// along the direction to the best of a few candidates.
func (w *workspace) trackSeed(h Hypothesis, v r3.Vector, t0 float64, u r3.Vector) fit.Track {
	f := w.f
	var q float64
	for _, i := range w.hits {
		q += w.hitQ[i]
	}
	q /= f.charge.m1
	lo, hi := f.EkinRange(h)
	best := fit.Track{Vertex: v, Time: t0, Dir: u, Ekin: math.Sqrt(lo * hi)}
	bestNLL := math.Inf(1)
	// The point fit lands where most light comes from: near the shower
	// maximum of an electron, mid-track for a muon. Try start points
	// behind it, re-aiming the ring at each; the energy that matches the
	// charge hardly depends on the start, so after the first candidate
	// one update from the last energy suffices.
	iters := 3
	for _, back := range []float64{0, 0.33, 0.67, 1.0} {
		tr := fit.Track{Vertex: v, Time: t0, Dir: u, Ekin: best.Ekin}
		for it := 0; it < iters; it++ {
			sh := back * w.lightLength(h, tr.Ekin)
			tr.Vertex = v.Sub(u.Mul(sh))
			if f.det.DistanceToWall(tr.Vertex) < 1 {
				tr.Vertex = v
				sh = 0
			}
			tr.Time = t0 - sh/phys.SpeedOfLight
			if it == 0 {
				tr.Dir = w.refineDirection(tr.Vertex, u)
			}
			w.predict(h, tr)
			var p float64
			for i := range w.muD {
				if !f.dead[i] {
					p += w.muD[i] + w.muI[i]
				}
			}
			if !(p > 0) {
				break
			}
			tr.Ekin = min(max(tr.Ekin*q/p, lo), hi)
		}
		iters = 1
		if n := w.nll(h, tr); n < bestNLL {
			best, bestNLL = tr, n
		}
	}
	return best
}

func (w *workspace) lightLength(h Hypothesis, e float64) float64 {
	w.f.species(h).interpolate(e, &w.prof)
	return w.prof.light90
}
