// Package fuzzhits encodes hit lists as bytes for the fitters' fuzz
// targets, so that the fuzzer can reach every value: 20 bytes a hit, the
// sensor index as a little-endian int32 and the time and charge as the
// bits of float64s (NaN, Inf, negative and out-of-range values included).
package fuzzhits

import (
	"encoding/binary"
	"math"

	"github.com/conelight/conelight/pmt"
)

// Decode reads the hits of b; a trailing partial hit is ignored.
func Decode(b []byte) []pmt.Hit {
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

// Encode is the inverse of Decode (sensor indices are kept to 32 bits).
func Encode(hits []pmt.Hit) []byte {
	var b []byte
	for _, h := range hits {
		b = binary.LittleEndian.AppendUint32(b, uint32(int32(h.Sensor)))
		b = binary.LittleEndian.AppendUint64(b, math.Float64bits(h.Time))
		b = binary.LittleEndian.AppendUint64(b, math.Float64bits(h.Charge))
	}
	return b
}
