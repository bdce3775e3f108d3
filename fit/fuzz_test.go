package fit_test

import (
	"encoding/binary"
	"math"
	"testing"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim"
)

// hitsFromBytes decodes arbitrary bytes into a hit list: 20 bytes a hit
// (sensor int32, time and charge as float64 bits), so the fuzzer can reach
// NaN, Inf, negative and out-of-range values.
func hitsFromBytes(b []byte) []pmt.Hit {
	var hits []pmt.Hit
	for len(b) >= 20 {
		hits = append(hits, pmt.Hit{
			Sensor: int(int32(binary.LittleEndian.Uint32(b))),
			Time:   math.Float64frombits(binary.LittleEndian.Uint64(b[4:])),
			Charge: math.Float64frombits(binary.LittleEndian.Uint64(b[12:])),
		})
		b = b[20:]
	}
	return hits
}

func hitsToBytes(hits []pmt.Hit) []byte {
	var b []byte
	for _, h := range hits {
		b = binary.LittleEndian.AppendUint32(b, uint32(int32(h.Sensor)))
		b = binary.LittleEndian.AppendUint64(b, math.Float64bits(h.Time))
		b = binary.LittleEndian.AppendUint64(b, math.Float64bits(h.Charge))
	}
	return b
}

// FuzzFit feeds the low-energy fitter arbitrary hit lists: it must never
// panic, and a result marked converged must be finite throughout.
func FuzzFit(f *testing.F) {
	cfg, err := sim.DemoConfig(3)
	if err != nil {
		f.Fatal(err)
	}
	fitter, err := fit.New(fit.Config{Detector: cfg.Detector, Sensor: cfg.Sensor, Water: cfg.Water})
	if err != nil {
		f.Fatal(err)
	}
	// Seeds: two simulated events and a few hand-made oddities.
	evs := study(f, cfg, fitter, 10, 100, 0, 2)
	for _, ev := range evs {
		f.Add(hitsToBytes(ev.hits))
	}
	f.Add(hitsToBytes([]pmt.Hit{{Sensor: 0, Time: 1, Charge: 1}}))
	f.Add(hitsToBytes([]pmt.Hit{{Sensor: 3, Time: math.NaN(), Charge: 1}, {Sensor: 4, Time: 2, Charge: math.Inf(1)}}))
	f.Add(hitsToBytes([]pmt.Hit{{Sensor: -1, Time: 0, Charge: 0}, {Sensor: 1 << 30, Time: 0, Charge: 0}}))
	f.Add([]byte{})
	f.Fuzz(func(t *testing.T, b []byte) {
		hits := hitsFromBytes(b)
		if len(hits) > 2000 {
			hits = hits[:2000]
		}
		r, err := fitter.Fit(hits)
		if err != nil || !r.Converged {
			return
		}
		vals := []float64{r.Vertex.X, r.Vertex.Y, r.Vertex.Z, r.Time, r.Dir.X, r.Dir.Y, r.Dir.Z, r.Energy,
			r.VertexErr.X, r.VertexErr.Y, r.VertexErr.Z, r.TimeErr, r.DirErr, r.EnergyErr, r.LogLikelihood}
		for i, v := range vals {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("converged result has non-finite value %d: %+v", i, r)
			}
		}
	})
}
