package pmt

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
)

// Origin says where the light behind a photoelectron came from (truth
// information; the detector cannot see it).
type Origin uint8

const (
	Direct    Origin = iota // unscattered Cherenkov light
	Scattered               // scattered in the water at least once
	Reflected               // reflected at the wall or a sensor at least once
	Dark                    // dark pulse, no photon
)

// String returns the name of o.
func (o Origin) String() string {
	switch o {
	case Direct:
		return "Direct"
	case Scattered:
		return "Scattered"
	case Reflected:
		return "Reflected"
	case Dark:
		return "Dark"
	}
	return fmt.Sprintf("Origin(%d)", uint8(o))
}

// Photoelectron is one photoelectron released at a sensor's photocathode:
// the sensor index, the time (ns) the photon reached the cathode, and
// where its light came from.
type Photoelectron struct {
	Sensor int
	Time   float64 // ns, before transit-time jitter
	Origin Origin
}

// Hit is one digitized sensor signal: sensor index, hit time (ns) and
// integrated charge (pe).
type Hit struct {
	Sensor int
	Time   float64 // ns
	Charge float64 // pe
}

// Digitizer turns photoelectrons into hits for one Model, keeping its
// scratch buffers between calls so that repeated Digitize calls do not
// allocate once the buffers have grown. A Digitizer is not safe for
// concurrent use; give each goroutine its own (the Model itself may be
// shared).
type Digitizer struct {
	model Model
	end   []int32   // per sensor: after filling, one past its last entry in times
	times []float64 // jittered photoelectron times, grouped by sensor
}

// NewDigitizer validates m and returns a Digitizer using a copy of it.
func NewDigitizer(m *Model) (*Digitizer, error) {
	if err := m.Validate(); err != nil {
		return nil, err
	}
	return &Digitizer{model: *m}, nil
}

// Model returns a copy of the model d digitizes with.
func (d *Digitizer) Model() Model { return d.model }

// Digitize validates m and digitizes pes with a temporary Digitizer; see
// Digitizer.Digitize. Use a Digitizer in loops to avoid its allocations.
func (m *Model) Digitize(pes []Photoelectron, nSensors int, rng *rand.Rand, dst []Hit) ([]Hit, error) {
	d, err := NewDigitizer(m)
	if err != nil {
		return dst, err
	}
	return d.Digitize(pes, nSensors, rng, dst)
}

// Digitize appends to dst the hits made by pes on sensors 0..nSensors-1
// and returns the extended slice. The appended hits are sorted by time
// (ties by sensor index).
//
// Each photoelectron gets its own Gaussian transit-time jitter of sigma
// TTS. On each sensor the earliest jittered photoelectron opens an
// integration gate [t, t+IntegrationWindow); the hit time is t (the
// earliest arrival, which is where a leading-edge discriminator fires) and
// its charge is the sum of independent single-pe charges (SPE) of every
// photoelectron inside the gate. The first photoelectron after the gate
// opens a new gate, so a sensor can give several hits (no dead time is
// modelled). A gate whose charge is below Threshold gives no hit; a charge
// above a positive Saturation is clipped to it.
//
// Random numbers are drawn in a fixed order (jitter in input order, then
// charges by sensor and time), so a fixed seed gives a fixed result. An
// error, naming the photoelectron, is returned for a sensor index outside
// [0, nSensors) or a non-finite time; dst is then returned unchanged.
func (d *Digitizer) Digitize(pes []Photoelectron, nSensors int, rng *rand.Rand, dst []Hit) ([]Hit, error) {
	if d == nil {
		return dst, errors.New("pmt: Digitize on a nil *Digitizer (build it with NewDigitizer)")
	}
	if nSensors < 0 || nSensors > math.MaxInt32 {
		return dst, fmt.Errorf("pmt: Digitize nSensors = %d must be in [0, %d]", nSensors, math.MaxInt32)
	}
	if len(pes) > math.MaxInt32 {
		return dst, fmt.Errorf("pmt: Digitize got %d photoelectrons, more than %d", len(pes), math.MaxInt32)
	}
	if rng == nil {
		return dst, errors.New("pmt: Digitize rng is nil")
	}
	for i, pe := range pes {
		if pe.Sensor < 0 || pe.Sensor >= nSensors {
			return dst, fmt.Errorf("pmt: Digitize pes[%d].Sensor = %d must be in [0, %d)", i, pe.Sensor, nSensors)
		}
		if math.IsNaN(pe.Time) || math.IsInf(pe.Time, 0) {
			return dst, fmt.Errorf("pmt: Digitize pes[%d].Time = %v must be finite", i, pe.Time)
		}
	}
	if len(pes) == 0 {
		return dst, nil
	}
	m := &d.model

	// Counting sort by sensor: O(len(pes) + nSensors), no map. After
	// the prefix sum end[s] is the start of sensor s's entries; placing
	// each entry advances it, leaving end[s] one past sensor s's last.
	d.end = slices.Grow(d.end[:0], nSensors)[:nSensors]
	clear(d.end)
	for _, pe := range pes {
		d.end[pe.Sensor]++
	}
	var sum int32
	for s, c := range d.end {
		d.end[s] = sum
		sum += c
	}
	d.times = slices.Grow(d.times[:0], len(pes))[:len(pes)]
	for _, pe := range pes {
		d.times[d.end[pe.Sensor]] = pe.Time + m.TTS*rng.NormFloat64()
		d.end[pe.Sensor]++
	}

	first := len(dst)
	var begin int32
	for s, end := range d.end {
		group := d.times[begin:end]
		begin = end
		if len(group) == 0 {
			continue
		}
		slices.Sort(group)
		for i := 0; i < len(group); {
			t0 := group[i]
			gateEnd := t0 + m.IntegrationWindow
			// The opening photoelectron is always in its gate, even where
			// t0 + IntegrationWindow rounds to t0 (|t0| above about 2^53
			// windows), so every gate consumes at least one.
			q := m.SPE.Sample(rng)
			for i++; i < len(group) && group[i] < gateEnd; i++ {
				q += m.SPE.Sample(rng)
			}
			if q < m.Threshold {
				continue
			}
			if m.Saturation > 0 && q > m.Saturation {
				q = m.Saturation
			}
			dst = append(dst, Hit{Sensor: s, Time: t0, Charge: q})
		}
	}
	slices.SortFunc(dst[first:], compareHitTime)
	return dst, nil
}

// compareHitTime orders hits by time, then sensor index. Hit times are
// finite here (inputs are validated), so plain comparisons suffice.
func compareHitTime(a, b Hit) int {
	switch {
	case a.Time < b.Time:
		return -1
	case a.Time > b.Time:
		return 1
	}
	return cmp.Compare(a.Sensor, b.Sensor)
}
