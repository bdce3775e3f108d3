package pmt

import (
	"encoding/binary"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// fuzzFloats decodes data as little-endian float64s (a trailing partial
// value is dropped), so that the fuzzer can reach every bit pattern,
// NaN and Inf included.
func fuzzFloats(data []byte) []float64 {
	v := make([]float64, len(data)/8)
	for i := range v {
		v[i] = math.Float64frombits(binary.LittleEndian.Uint64(data[8*i:]))
	}
	return v
}

func floatBytes(v ...float64) []byte {
	b := make([]byte, 0, 8*len(v))
	for _, x := range v {
		b = binary.LittleEndian.AppendUint64(b, math.Float64bits(x))
	}
	return b
}

// FuzzCurve builds curves from arbitrary points: first half x, second
// half y. NewCurve either refuses them or gives a curve that is finite
// everywhere, equal to the tabulated values at the knots and within
// [Min, Max] up to rounding, and 0 outside its range.
func FuzzCurve(f *testing.F) {
	f.Add(floatBytes(0, 1, 0, 1), 0.5)
	f.Add(floatBytes(280, 300, 320, 0.03, 0.25, 0.6), 310.0)
	f.Add(floatBytes(0, 0, 1, 1), 0.0)                                                                                                            // repeated x
	f.Add(floatBytes(0, math.NaN(), 0, 1), 0.0)                                                                                                   // NaN x
	f.Add(floatBytes(-1e308, 1e308, 0, 1), 1e308)                                                                                                 // span overflows
	f.Add(floatBytes(0, 1e10, -1e308, 1e308), 5e9)                                                                                                // y difference overflows
	f.Add(floatBytes(0, 1e10, 0, 1.7e308), 1e10)                                                                                                  // product overflows
	f.Add(floatBytes(0, 5e-324, 1e-300, 1, 2, 3), 1e-300)                                                                                         // subnormal spacing
	f.Add(floatBytes(0, 9.005004792076203e-308, 1.398043286095289e-76, 1.398043286095289e-76, 9.162216479754085e-72, 1.398043286095289e-76), 0.0) // product underflows (found by the fuzzer)
	f.Add(floatBytes(1, 2, 4, 8, 16, 32, 0, -1, 1, -1, 1, 0), math.Inf(1))                                                                        // many knots
	f.Fuzz(func(t *testing.T, data []byte, x float64) {
		v := fuzzFloats(data)
		xs, ys := v[:len(v)/2], v[len(v)/2:]
		c, err := NewCurve(xs, ys)
		if err != nil {
			if c.Valid() {
				t.Fatalf("NewCurve error %v with a valid curve", err)
			}
			if c.At(x) != 0 {
				t.Fatalf("zero Curve At(%v) = %v", x, c.At(x))
			}
			return
		}
		lo, hi := c.Range()
		cmin, cmax := c.Min(), c.Max()
		// Linear interpolation stays within the segment's end values up
		// to the rounding of its few operations (common practice: a
		// few ulps of the largest value).
		slack := 4*0x1p-52*math.Max(math.Abs(cmin), math.Abs(cmax)) + 0x1p-1072
		check := func(x float64) {
			y := c.At(x)
			switch {
			case math.IsNaN(y) || math.IsInf(y, 0):
				t.Fatalf("At(%v) = %v", x, y)
			case !(x >= lo && x <= hi):
				if y != 0 {
					t.Fatalf("At(%v) = %v outside [%v, %v], want 0", x, y, lo, hi)
				}
			case y < cmin-slack || y > cmax+slack:
				t.Fatalf("At(%v) = %v outside [Min, Max] = [%v, %v]", x, y, cmin, cmax)
			}
		}
		check(x)
		for i := range xs {
			check(xs[i])
			if i+1 < len(xs) {
				if y := c.At(xs[i]); math.Abs(y-ys[i]) > slack {
					t.Fatalf("At(x[%d] = %v) = %v, want y[%d] = %v", i, xs[i], y, i, ys[i])
				}
				check(xs[i] + (xs[i+1]-xs[i])/2)
			}
		}
	})
}

// FuzzDigitize digitizes arbitrary photoelectron lists (sensor indices
// in and out of range, any time bits) with a model whose timing, gate and
// threshold come from the fuzzer. Digitize either returns an error with
// dst unchanged, or sorted hits on valid sensors with finite times and
// charges at or above threshold, never more hits than photoelectrons.
func FuzzDigitize(f *testing.F) {
	f.Add(floatBytes(0, 10, 1, 12, 2, 100), 3, 1.3, 30.0, 0.5, uint64(1))
	f.Add(floatBytes(0, 1e300, 0, 1e300, 0, -1e300), 1, 0.0, 1.0, 0.25, uint64(2)) // gate rounds away
	f.Add(floatBytes(0, math.NaN()), 1, 1.0, 30.0, 0.5, uint64(3))
	f.Add(floatBytes(0, math.Inf(-1)), 1, 1.0, 30.0, 0.5, uint64(4))
	f.Add(floatBytes(5, 0), 3, 1.0, 30.0, 0.5, uint64(5))
	f.Add(floatBytes(-1, 0), 3, 1.0, 30.0, 0.5, uint64(6))
	f.Add(floatBytes(0, 0, 0, 0), 1, math.NaN(), 30.0, 0.5, uint64(7))
	f.Add(floatBytes(0, 0, 0, 0), 1, 1.0, 0.0, 0.0, uint64(8))
	f.Add(floatBytes(0, 0), -1, 1.0, 30.0, 0.5, uint64(9))
	f.Add(floatBytes(0, 1.7e308, 0, 1.7e308), 1, 1e300, 1e308, 0.0, uint64(10))
	f.Fuzz(func(t *testing.T, data []byte, nSensors int, tts, window, threshold float64, seed uint64) {
		v := fuzzFloats(data)
		pes := make([]Photoelectron, len(v)/2)
		for i := range pes {
			s := v[2*i]
			sensor := -1
			if s >= -2 && s < 1<<20 {
				sensor = int(s)
			}
			pes[i] = Photoelectron{Sensor: sensor, Time: v[2*i+1], Origin: Origin(i % 4)}
		}
		nSensors = min(nSensors, 1<<16) // keep each iteration's scratch small
		m := Medium()
		m.TTS, m.IntegrationWindow, m.Threshold = tts, window, threshold
		m.Saturation = 0
		if m.Threshold < 1e3 {
			m.Saturation = 1e3
		}
		dst := []Hit{{Sensor: -7, Time: math.NaN()}} // a sentinel that must survive
		hits, err := m.Digitize(pes, nSensors, rand.New(rand.NewPCG(seed, 1)), dst)
		if len(hits) < 1 || hits[0].Sensor != -7 {
			t.Fatal("Digitize lost the caller's dst prefix")
		}
		if err != nil {
			if len(hits) != 1 {
				t.Fatalf("Digitize error %v but appended %d hits", err, len(hits)-1)
			}
			return
		}
		hits = hits[1:]
		if len(hits) > len(pes) {
			t.Fatalf("%d hits from %d photoelectrons", len(hits), len(pes))
		}
		for i, h := range hits {
			switch {
			case h.Sensor < 0 || h.Sensor >= nSensors:
				t.Fatalf("hit %d on sensor %d of %d", i, h.Sensor, nSensors)
			case math.IsNaN(h.Time) || math.IsInf(h.Time, 0):
				t.Fatalf("hit %d time %v", i, h.Time)
			case math.IsNaN(h.Charge) || math.IsInf(h.Charge, 0) || h.Charge < m.Threshold:
				t.Fatalf("hit %d charge %v, threshold %v", i, h.Charge, m.Threshold)
			case m.Saturation > 0 && h.Charge > m.Saturation:
				t.Fatalf("hit %d charge %v above saturation %v", i, h.Charge, m.Saturation)
			}
		}
		if !slices.IsSortedFunc(hits, compareHitTime) {
			t.Fatal("hits not sorted by time and sensor")
		}
		tr := Trigger{Threshold: 2, Window: 200, PostTrigger: 500}
		if _, _, err := tr.Find(hits); err != nil {
			t.Fatalf("Trigger.Find on Digitize output: %v", err)
		}
	})
}

// TestDigitizeHugeTimes is the regression test for a hang: at |t| where
// t + IntegrationWindow rounds to t, the gate held no photoelectron and
// the loop never advanced. Each photoelectron now opens its own gate and
// the charge is conserved (unit single-pe charges, no jitter).
func TestDigitizeHugeTimes(t *testing.T) {
	m := Medium()
	m.TTS, m.SPE, m.IntegrationWindow, m.Threshold = 0, SPE{}, 1, 0.5
	pes := []Photoelectron{{Sensor: 0, Time: 1e300}, {Sensor: 0, Time: 1e300}, {Sensor: 1, Time: -1e300}}
	hits, err := m.Digitize(pes, 2, rand.New(rand.NewPCG(1, 1)), nil)
	if err != nil {
		t.Fatal(err)
	}
	var q float64
	for _, h := range hits {
		q += h.Charge
	}
	if len(hits) != 3 || q != 3 || hits[0].Time != -1e300 {
		t.Errorf("hits %v, want three of 1 pe, the first at -1e300 ns", hits)
	}
}

// TestNilModel checks that nil receivers give errors, not panics.
func TestNilModel(t *testing.T) {
	var m *Model
	if err := m.Validate(); err == nil {
		t.Error("nil Model validated")
	}
	if _, err := m.Digitize(nil, 1, rand.New(rand.NewPCG(1, 1)), nil); err == nil {
		t.Error("Digitize with a nil Model: no error")
	}
	if _, err := m.AddDark(nil, 1, 0, 1, rand.New(rand.NewPCG(1, 1))); err == nil {
		t.Error("AddDark with a nil Model: no error")
	}
	var d *Digitizer
	if _, err := d.Digitize(nil, 1, rand.New(rand.NewPCG(1, 1)), nil); err == nil {
		t.Error("nil Digitizer: no error")
	}
	med := Medium()
	if _, err := med.AddDark(nil, 0, -1e308, 1e308, rand.New(rand.NewPCG(1, 1))); err == nil {
		t.Error("AddDark over an overflowing interval: no error")
	}
}
