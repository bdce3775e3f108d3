package fit

import (
	"fmt"
	"math"
	"slices"

	"github.com/conelight/conelight/pmt"
)

// CheckHits checks hits against a detector of nSensors sensors whose
// integration gate is gate ns (pmt.Model.IntegrationWindow). A hit must
// name a sensor in [0, nSensors), have a finite time and a finite,
// positive charge; two hits of one sensor must be at least one gate apart,
// since the digitizer opens a new gate only after the previous one closes
// (a hit given twice, or hits of one sensor from two overlapping
// readouts, would otherwise be counted as light twice). The error names
// the hit, the field and the value. The hits are not modified.
func CheckHits(hits []pmt.Hit, nSensors int, gate float64) error {
	for i, h := range hits {
		switch {
		case h.Sensor < 0 || h.Sensor >= nSensors:
			return fmt.Errorf("hits[%d].Sensor = %d outside the detector's [0, %d)", i, h.Sensor, nSensors)
		case math.IsNaN(h.Time) || math.IsInf(h.Time, 0):
			return fmt.Errorf("hits[%d].Time = %v must be finite", i, h.Time)
		case math.IsNaN(h.Charge) || math.IsInf(h.Charge, 0) || !(h.Charge > 0):
			return fmt.Errorf("hits[%d].Charge = %v must be finite and positive (pe)", i, h.Charge)
		}
	}
	// Order by sensor, then time, to find hits of one sensor within a
	// gate of each other.
	idx := make([]int, len(hits))
	for i := range idx {
		idx[i] = i
	}
	slices.SortFunc(idx, func(a, b int) int {
		ha, hb := hits[a], hits[b]
		if ha.Sensor != hb.Sensor {
			return ha.Sensor - hb.Sensor
		}
		switch {
		case ha.Time < hb.Time:
			return -1
		case ha.Time > hb.Time:
			return 1
		}
		return a - b
	})
	for k := 1; k < len(idx); k++ {
		a, b := hits[idx[k-1]], hits[idx[k]]
		if a.Sensor == b.Sensor && b.Time-a.Time < gate {
			return fmt.Errorf("hits[%d] and hits[%d] are both on sensor %d at %v and %v ns, closer than its %v ns integration gate (a hit given twice?)",
				idx[k-1], idx[k], a.Sensor, a.Time, b.Time, gate)
		}
	}
	return nil
}
