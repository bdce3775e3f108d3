package pmt

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"

	"gonum.org/v1/gonum/stat/distuv"
)

// maxDarkMean bounds the expected dark count of one AddDark call so that a
// mistaken unit (seconds for ns) fails instead of exhausting memory.
const maxDarkMean = 1e8

// AddDark appends to dst the dark pulses of nSensors sensors during
// [t0, t1) (ns) and returns the extended slice. The total count is
// Poisson with mean nSensors * DarkRate * (t1-t0) * 1e-9; each pulse is one
// photoelectron of Origin Dark on a sensor drawn uniformly and at a time
// drawn uniformly in [t0, t1). Pass the result through Digitize with the
// signal photoelectrons. Bad arguments return an error naming them and
// leave dst unchanged.
func (m *Model) AddDark(dst []Photoelectron, nSensors int, t0, t1 float64, rng *rand.Rand) ([]Photoelectron, error) {
	switch {
	case m == nil:
		return dst, errors.New("pmt: AddDark on a nil *Model")
	case nSensors < 0:
		return dst, fmt.Errorf("pmt: AddDark nSensors = %d must be non-negative", nSensors)
	case math.IsNaN(t0) || math.IsInf(t0, 0):
		return dst, fmt.Errorf("pmt: AddDark t0 = %v must be finite", t0)
	case math.IsNaN(t1) || math.IsInf(t1, 0):
		return dst, fmt.Errorf("pmt: AddDark t1 = %v must be finite", t1)
	case t1 < t0:
		return dst, fmt.Errorf("pmt: AddDark t1 = %v must not be before t0 = %v", t1, t0)
	case math.IsInf(t1-t0, 0):
		return dst, fmt.Errorf("pmt: AddDark t1-t0 = %v - %v overflows", t1, t0)
	case !(m.DarkRate >= 0) || math.IsInf(m.DarkRate, 0):
		return dst, fmt.Errorf("pmt: Model.DarkRate = %v must be non-negative and finite (Hz)", m.DarkRate)
	case rng == nil:
		return dst, errors.New("pmt: AddDark rng is nil")
	}
	mean := float64(nSensors) * m.DarkRate * (t1 - t0) * 1e-9
	if mean == 0 {
		return dst, nil
	}
	if mean > maxDarkMean {
		return dst, fmt.Errorf("pmt: AddDark expected count %v (nSensors = %d, DarkRate = %v Hz, t1-t0 = %v ns) exceeds %v",
			mean, nSensors, m.DarkRate, t1-t0, maxDarkMean)
	}
	n := int(distuv.Poisson{Lambda: mean, Src: rng}.Rand())
	span := t1 - t0
	for range n {
		dst = append(dst, Photoelectron{
			Sensor: rng.IntN(nSensors),
			Time:   t0 + span*rng.Float64(),
			Origin: Dark,
		})
	}
	return dst, nil
}
