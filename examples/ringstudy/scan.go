package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"sync"

	"github.com/conelight/conelight/examples/internal/detflag"
	"github.com/conelight/conelight/examples/internal/parallel"
	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/ring"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/phys"
)

// scanShifts are the vertex shifts of the scan along the true direction
// (cm); the time moves by shift/c with them.
var scanShifts = []float64{-60, -50, -40, -30, -20, -10, 0, 10, 20, 30, 40, 50, 60}

// scan is the light-model diagnostic: for each point it simulates o.n
// events and, at the true direction and energy, sums the charge and the
// time parts of the negative log likelihood (ring.Fitter.NLLParts) with
// the vertex moved along the true axis, and prints the summed curves and
// the minimum of each (parabola through the lowest point and its
// neighbours). A part whose minimum lies away from zero pulls the fit's
// vertex along the track: that part of the light model is biased.
func scan(ctx context.Context, w io.Writer, o options) error {
	if o.n < 1 || o.n > maxEvents {
		return fmt.Errorf("-n = %d outside [1, %d]", o.n, maxEvents)
	}
	cfg, err := detflag.Config(o.detector, o.seed)
	if err != nil {
		return err
	}
	cfg.Workers = 1
	s, err := sim.New(cfg)
	if err != nil {
		return err
	}
	f, err := ring.New(ring.Config{Setup: s.Config().Setup, SkipUncertainties: true})
	if err != nil {
		return err
	}
	for i, pt := range o.points {
		seed := o.seed + uint64(i)
		h := ring.Electron
		if pt.pdg == phys.MuonMinus {
			h = ring.Muon
		}
		var mu sync.Mutex
		q, t := make([]float64, len(scanShifts)), make([]float64, len(scanShifts))
		used := 0
		var firstErr error
		err := parallel.Each(ctx, o.n, func() struct{} { return struct{}{} }, func(_ struct{}, k int) {
			rng := rand.New(rand.NewPCG(seed, uint64(k)))
			hits, tt, err := simulateContained(s, rng, pt, o.wall, seed, k)
			if err != nil {
				mu.Lock()
				firstErr = err
				mu.Unlock()
				return
			}
			if hits == nil {
				return
			}
			eq, et := make([]float64, len(scanShifts)), make([]float64, len(scanShifts))
			for j, x := range scanShifts {
				tr := fit.Track{Vertex: tt.pos.Add(tt.dir.Mul(x)), Time: x / phys.SpeedOfLight, Dir: tt.dir, Ekin: tt.ekin}
				if eq[j], et[j], err = f.NLLParts(hits, ring.Window{}, h, tr); err != nil {
					break
				}
			}
			mu.Lock()
			defer mu.Unlock()
			if err != nil {
				// a shifted vertex outside the tank: the event is left out
				return
			}
			used++
			for j := range scanShifts {
				q[j] += eq[j]
				t[j] += et[j]
			}
		})
		if err == nil {
			err = firstErr
		}
		if err != nil {
			return err
		}
		fmt.Fprintf(w, "%s: %d events; summed -log L relative to the true vertex, vertex moved along the true axis:\n%8s %12s %12s %12s\n", pt.name, used, "shift cm", "charge", "time", "total")
		c0, t0 := q[len(q)/2], t[len(t)/2]
		tot := make([]float64, len(q))
		for j, x := range scanShifts {
			tot[j] = q[j] + t[j]
			fmt.Fprintf(w, "%+8.0f %+12.2f %+12.2f %+12.2f\n", x, unsignedZero(q[j]-c0), unsignedZero(t[j]-t0), unsignedZero(tot[j]-c0-t0))
		}
		fmt.Fprintf(w, "minimum: charge %+.1f cm, time %+.1f cm, total %+.1f cm\n\n", scanMinimum(scanShifts, q), scanMinimum(scanShifts, t), scanMinimum(scanShifts, tot))
	}
	return nil
}

// scanMinimum returns the minimum of the parabola through the lowest
// point of y(x) and its neighbours (the end point when it is lowest).
func scanMinimum(x, y []float64) float64 {
	k := 0
	for i := range y {
		if y[i] < y[k] {
			k = i
		}
	}
	if k == 0 || k == len(y)-1 {
		return x[k]
	}
	y0, y1, y2 := y[k-1], y[k], y[k+1]
	den := y0 - 2*y1 + y2
	if den <= 0 {
		return x[k]
	}
	return x[k] + 0.5*(x[k+1]-x[k])*(y0-y2)/den
}

// unsignedZero returns 0 for a value that prints as zero at two decimals,
// so that rounding noise at the reference point never prints as "-0.00".
func unsignedZero(v float64) float64 {
	if math.Abs(v) < 0.005 {
		return 0
	}
	return v
}
