package ring

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/phys"
)

// Window is the readout window of an event (ns, event clock): hits outside
// it are ignored, and its length sets the dark-noise level of the time
// likelihood. The zero Window means the span of the hits.
type Window struct {
	Lo, Hi float64
}

// promptBefore and promptAfter (ns) bound the hits used around the
// point-fit time: before it only dark noise, long after it a decay
// electron or the next event.
const promptBefore = 60

// selectEvent loads the hits (setEvent) and keeps those of the event's
// prompt light, finding the point seed on the way, since the prompt
// window is defined about it. It returns the point seed's vertex and
// time, the number of hits kept and dropped, or the status and error of
// an event that cannot be fitted.
func (w *workspace) selectEvent(hits []pmt.Hit, win Window) (v r3.Vector, t0 float64, used, dropped int, st fit.Status, err error) {
	if _, dropped, st, err = w.setEvent(hits, win); err != nil {
		return v, t0, 0, dropped, st, err
	}
	// The ring is the brightest burst of light: a muon's decay electron
	// microseconds later, or a second interaction, in the same readout
	// must not take the point seed.
	tc := w.brightestBurst(w.f.crossingTime())
	dropped += w.restrict(tc-promptBefore, tc+w.f.promptAfter())
	v, t0 = w.pointSeed()
	dropped += w.restrict(t0-promptBefore, t0+w.f.promptAfter())
	// Seen from the point seed, the ring's direct light arrives within
	// the track's length in time and its scattered light a few delay
	// constants later; a muon's decay electron a hundred nanoseconds on
	// stands apart.
	dropped += w.restrictLate(v, t0, w.f.lateResidual())
	used = len(w.hits)
	if used == 0 {
		return v, t0, 0, dropped, fit.NoHits, errors.New("ring: no hit left in the prompt window")
	}
	return v, t0, used, dropped, fit.Converged, nil
}

// selectAround loads the hits (setEvent) and keeps those in the prompt
// window about time t0 (a caller's seed), or returns the status and error
// of an event that cannot be fitted.
func (w *workspace) selectAround(hits []pmt.Hit, win Window, t0 float64) (fit.Status, error) {
	if _, _, st, err := w.setEvent(hits, win); err != nil {
		return st, err
	}
	w.restrict(t0-promptBefore, t0+w.f.promptAfter())
	if len(w.hits) == 0 {
		return fit.NoHits, errors.New("ring: no hit in the prompt window of the seed")
	}
	return fit.Converged, nil
}

// setEvent loads the hits into the workspace: the first hit of each live
// sensor inside the window. It returns the number of hits used and the
// number dropped (outside the window, on dead sensors or later hits of a
// sensor already hit), or the status and error of an event that cannot
// be fitted.
func (w *workspace) setEvent(hits []pmt.Hit, win Window) (used, dropped int, st fit.Status, err error) {
	f := w.f
	for _, i := range w.hits {
		w.hitQ[i] = -1
	}
	w.hits = w.hits[:0]
	if len(hits) == 0 {
		return 0, 0, fit.NoHits, errors.New("ring: event has no hits")
	}
	if err := fit.CheckHits(hits, f.n, f.cfg.Sensor.IntegrationWindow); err != nil {
		return 0, 0, fit.BadInput, fmt.Errorf("ring: %w", err)
	}
	if win == (Window{}) {
		win.Lo, win.Hi = math.Inf(1), math.Inf(-1)
		for _, h := range hits {
			win.Lo, win.Hi = math.Min(win.Lo, h.Time), math.Max(win.Hi, h.Time)
		}
		win.Hi = math.Max(win.Hi, win.Lo+1)
	}
	if !finite(win.Lo) || !finite(win.Hi) || !(win.Hi > win.Lo) {
		return 0, 0, fit.BadInput, fmt.Errorf("ring: Window {Lo: %g, Hi: %g} must be finite with Hi > Lo", win.Lo, win.Hi)
	}
	w.window = win.Hi - win.Lo
	for _, h := range hits {
		if h.Time < win.Lo || h.Time > win.Hi || f.dead[h.Sensor] {
			dropped++
			continue
		}
		i := h.Sensor
		if w.hitQ[i] < 0 {
			w.hits = append(w.hits, i)
			w.hitQ[i], w.hitT[i] = h.Charge, h.Time
			continue
		}
		dropped++
		if h.Time < w.hitT[i] {
			w.hitQ[i], w.hitT[i] = h.Charge, h.Time
		}
	}
	if len(w.hits) == 0 {
		return 0, dropped, fit.NoHits, fmt.Errorf("ring: no hit of the %d lies inside the readout window [%g, %g] ns on a live sensor", len(hits), win.Lo, win.Hi)
	}
	return len(w.hits), dropped, fit.Converged, nil
}

// restrict keeps only the hits with times in [lo, hi]: light before the
// event or long after it (a decay electron, the next interaction) is not
// part of the ring. It returns the number removed.
func (w *workspace) restrict(lo, hi float64) int {
	return w.dropHits(func(i int) bool { t := w.hitT[i]; return t < lo || t > hi })
}

// dropHits removes from the loaded event the hit sensors for which drop
// is true (they count as unhit from then on) and returns their number.
func (w *workspace) dropHits(drop func(i int) bool) int {
	kept := w.hits[:0]
	removed := 0
	for _, i := range w.hits {
		if drop(i) {
			w.hitQ[i] = -1
			removed++
			continue
		}
		kept = append(kept, i)
	}
	w.hits = kept
	return removed
}

// arrival is hit sensor i's time less the light's travel time from v at
// the spectrum-averaged group velocity: the emission time of a point
// source at v that the hit implies.
func (w *workspace) arrival(i int, v r3.Vector) float64 {
	f := w.f
	dx, dy, dz := f.px[i]-v.X, f.py[i]-v.Y, f.pz[i]-v.Z
	return w.hitT[i] - math.Sqrt(dx*dx+dy*dy+dz*dz)*f.resp.invGroup
}

// crossingTime is the time light takes along the tank's diagonal: the
// spread of the direct-light arrival times of one event.
func (f *Fitter) crossingTime() float64 {
	return math.Hypot(2*f.tankRadius, 2*f.tankHalfZ) * f.resp.invGroup
}

// brightestBurst returns the start of the time window of length width
// that holds the most hit charge.
func (w *workspace) brightestBurst(width float64) float64 {
	type tq struct{ t, q float64 }
	hs := make([]tq, 0, len(w.hits))
	for _, i := range w.hits {
		hs = append(hs, tq{w.hitT[i], w.hitQ[i]})
	}
	slices.SortFunc(hs, func(a, b tq) int { return cmp.Compare(a.t, b.t) })
	best, bt := -1.0, hs[0].t
	var sum float64
	j := 0
	for k := range hs {
		sum += hs[k].q
		for hs[k].t-hs[j].t > width {
			sum -= hs[j].q
			j++
		}
		if sum > best {
			best, bt = sum, hs[j].t
		}
	}
	return bt
}

// promptAfter is the longest a ring's light can take after the vertex
// time: a track and its light crossing the tank twice over, plus margin.
func (f *Fitter) promptAfter() float64 {
	return 2*math.Hypot(2*f.tankRadius, 2*f.tankHalfZ)*f.resp.invGroup + 100
}

// lateResidual (ns) is the latest time residual, about the point seed's
// vertex and time, of a hit kept for the track fit: the light of the
// longest track of the tables emitted after the seed point, plus three
// delay constants of the indirect light (which leaves exp(-3), 5%, of
// that light out).
func (f *Fitter) lateResidual() float64 {
	return f.energyHi[Muon]/muonLossPerCm/phys.SpeedOfLight + 3*f.lateTau
}

// muonLossPerCm (MeV/cm) converts the top muon energy of the tables into
// a track length: minimum-ionizing loss in water, about 2 MeV/cm (PDG
// Review, Passage of particles through matter; rounded).
const muonLossPerCm = 2.0

// restrictLate drops the hits whose time residual about a point source at
// v, t0 (t - t0 - |x - v|/v_g) exceeds late, and returns their number. A
// late burst is dimmer than the ring (brightestBurst chose the ring), so
// when the hits to drop are half the hits or hold half the charge, the
// point seed is what is wrong, and nothing is dropped.
func (w *workspace) restrictLate(v r3.Vector, t0, late float64) int {
	isLate := func(i int) bool { return w.arrival(i, v)-t0 > late }
	var all, lateQ float64
	nLate := 0
	for _, i := range w.hits {
		all += w.hitQ[i]
		if isLate(i) {
			lateQ += w.hitQ[i]
			nLate++
		}
	}
	if !(lateQ < 0.5*all) || 2*nLate >= len(w.hits) {
		return 0
	}
	return w.dropHits(isLate)
}
