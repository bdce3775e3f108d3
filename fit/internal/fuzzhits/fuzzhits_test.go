package fuzzhits

import (
	"math"
	"reflect"
	"testing"

	"github.com/conelight/conelight/pmt"
)

func TestRoundTrip(t *testing.T) {
	hits := []pmt.Hit{{Sensor: 3, Time: 1.5, Charge: 2}, {Sensor: -7, Time: math.Inf(-1), Charge: 0}}
	b := Encode(hits)
	if len(b) != 40 {
		t.Fatalf("%d bytes for 2 hits", len(b))
	}
	if got := Decode(append(b, 1, 2, 3)); !reflect.DeepEqual(got, hits) {
		t.Errorf("round trip %+v, want %+v", got, hits)
	}
}
