package ring

import (
	"math"
	"math/rand/v2"
	"runtime"
	"sync"
	"testing"
	"time"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

// point is one regression point: a particle at a fixed momentum.
type point struct {
	name string
	pdg  int
	p    float64 // MeV/c
}

// sample collects the fit errors of one point.
type sample struct {
	n, failed, misID int
	errorsValid      int       // fits of the true hypothesis with uncertainties
	vertex, angle    []float64 // cm, degrees
	momentum         []float64 // |p_fit/p_true - 1|
	enu              []float64 // |E_nu,fit/E_nu,true - 1| for QE events
	pulls            map[string][]float64
	reasons          map[string]int // why fits of the true hypothesis failed
	cpu              time.Duration  // summed fit time
	// pid holds the reconstructions with both fits converged, by event
	// index, for the identity cut.
	pid []pidPoint
	// crb holds the Cramer-Rao bounds of the true hypothesis's fits:
	// vertex (cm, the three coordinates in quadrature), direction
	// (degrees) and relative momentum.
	crbVertex, crbAngle, crbMomentum []float64
}

// pidPoint is one event's reconstruction and its index in the sample.
type pidPoint struct {
	k   int
	rec Reconstruction
}

// trueTrack is what the fit is compared with.
type trueTrack struct {
	pos, dir r3.Vector
	ekin     float64
	enu      float64
	beam     r3.Vector
}

// study simulates and fits n events of a point in parallel and collects
// the errors of the fit of the true hypothesis. Vertices are uniform in
// the fiducial volume minWall inside the sensor surface, directions
// isotropic; muons that leave the tank are replaced by the next candidate
// (fully contained events only). qe, when set, draws the events from the
// quasi-elastic generator instead (pdg gives the neutrino flavour's lepton).
func study(t testing.TB, s *sim.Simulator, f *Fitter, pt point, n int, minWall float64, seed uint64, qe *gen.QE) sample {
	t.Helper()
	var hyp Hypothesis
	if pt.pdg == phys.MuonMinus {
		hyp = Muon
	}
	out := sample{n: n, pulls: map[string][]float64{}, reasons: map[string]int{}}
	var mu sync.Mutex
	jobs := make(chan int)
	var wg sync.WaitGroup
	workers := runtime.GOMAXPROCS(0)
	for wk := 0; wk < workers; wk++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			w := f
			for k := range jobs {
				rng := rand.New(rand.NewPCG(seed, uint64(k)))
				var tt trueTrack
				evHits := simulateContained(t, s, rng, pt, minWall, seed, k, qe, &tt)
				if evHits == nil {
					mu.Lock()
					out.failed++
					mu.Unlock()
					continue
				}
				t0 := time.Now()
				rec, err := w.Fit(evHits, Window{})
				el := time.Since(t0)
				mu.Lock()
				out.cpu += el
				if err != nil {
					out.failed++
					mu.Unlock()
					continue
				}
				if (PIDCut{}).PDG(&rec) != pt.pdg {
					out.misID++
				}
				if rec.Electron.Status == fit.Converged && rec.Muon.Status == fit.Converged {
					out.pid = append(out.pid, pidPoint{k, rec})
				}
				r := rec.Electron
				if hyp == Muon {
					r = rec.Muon
				}
				if r.Status != fit.Converged {
					reason := r.Reason
					if len(reason) > 40 {
						reason = reason[:40]
					}
					out.reasons[reason]++
					out.failed++
					mu.Unlock()
					continue
				}
				if math.IsNaN(r.NLL) || math.IsNaN(r.Errors.Ekin) || math.IsNaN(r.Track.Ekin) {
					t.Errorf("%s event %d: converged result holds NaN: %+v", pt.name, k, r)
				}
				out.vertex = append(out.vertex, r.Track.Vertex.Sub(tt.pos).Norm())
				out.angle = append(out.angle, math.Acos(math.Min(1, r.Track.Dir.Dot(tt.dir)))*180/math.Pi)
				pTrue := phys.Momentum(tt.ekin, hyp.Mass())
				out.momentum = append(out.momentum, math.Abs(r.Momentum/pTrue-1))
				if qe != nil {
					if e, err := NeutrinoEnergy(&r, tt.beam); err == nil {
						out.enu = append(out.enu, math.Abs(e/tt.enu-1))
					}
				}
				if r.ErrorsValid && r.CramerRao.Ekin > 0 {
					out.crbVertex = append(out.crbVertex, r.CramerRao.Vertex.Norm())
					out.crbAngle = append(out.crbAngle, math.Hypot(r.CramerRao.Angle[0], r.CramerRao.Angle[1])*180/math.Pi)
					out.crbMomentum = append(out.crbMomentum, r.CramerRao.Momentum/r.Momentum)
				}
				if r.ErrorsValid {
					out.errorsValid++
					d := r.Track.Vertex.Sub(tt.pos)
					out.pulls["x"] = append(out.pulls["x"], d.X/r.Errors.Vertex.X)
					out.pulls["y"] = append(out.pulls["y"], d.Y/r.Errors.Vertex.Y)
					out.pulls["z"] = append(out.pulls["z"], d.Z/r.Errors.Vertex.Z)
					out.pulls["t"] = append(out.pulls["t"], r.Track.Time/r.Errors.Time)
					e1, e2 := phys.Basis(r.Track.Dir)
					out.pulls["angle"] = append(out.pulls["angle"], -tt.dir.Dot(e1)/r.Errors.Angle[0], -tt.dir.Dot(e2)/r.Errors.Angle[1])
					out.pulls["energy"] = append(out.pulls["energy"], (r.Track.Ekin-tt.ekin)/r.Errors.Ekin)
				}
				mu.Unlock()
			}
		}()
	}
	for k := 0; k < n; k++ {
		jobs <- k
	}
	close(jobs)
	wg.Wait()
	return out
}

// simulateContained draws vertex (uniform minWall or more inside the
// sensor surface) and direction (isotropic), or a QE interaction, from
// rng until the lepton stops inside the tank (electron showers always
// count as contained) and returns the event's hits.
func simulateContained(t testing.TB, s *sim.Simulator, rng *rand.Rand, pt point, minWall float64, seed uint64, k int, qe *gen.QE, tt *trueTrack) []pmt.Hit {
	t.Helper()
	det := s.Config().Detector
	vertices := gen.InFiducial(det.Tank(), minWall)
	mass := phys.ElectronMass
	if pt.pdg == phys.MuonMinus {
		mass = phys.MuonMass
	}
	for try := 0; try < 50; try++ {
		var prim phys.Particle
		if qe != nil {
			ps, info, err := qe.Generate(uint64(k), rng, nil)
			if err != nil {
				t.Error(err)
				return nil
			}
			prim = ps[0]
			tt.enu, tt.beam = info.NeutrinoEtot, info.NeutrinoDir
		} else {
			prim = phys.Particle{PDG: pt.pdg, Pos: vertices.Sample(rng), Dir: gen.Isotropic().Sample(rng),
				Ekin: phys.KineticFromMomentum(pt.p, mass)}
		}
		num := seed<<20 + uint64(k)<<6 + uint64(try)
		ev, err := s.Event(num, []phys.Particle{prim})
		if err != nil {
			t.Error(err)
			return nil
		}
		if !ev.Truth.Triggered || len(ev.Hits) == 0 {
			continue
		}
		if prim.PDG == phys.MuonMinus || prim.PDG == phys.MuonPlus {
			// contained: the muon's straight range ends inside
			end := prim.Pos.Add(prim.Dir.Mul(ev.Truth.Tracks[0].Range))
			if det.DistanceToWall(end) < 50 {
				continue
			}
		}
		tt.pos, tt.dir, tt.ekin = prim.Pos, prim.Dir, prim.Ekin
		return ev.Hits
	}
	return nil
}
