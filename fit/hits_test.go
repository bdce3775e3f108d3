package fit

import (
	"math"
	"strings"
	"testing"

	"github.com/conelight/conelight/pmt"
)

func TestCheckHits(t *testing.T) {
	good := []pmt.Hit{{Sensor: 3, Time: 10, Charge: 1.2}, {Sensor: 1, Time: 12, Charge: 0.4}, {Sensor: 3, Time: 500, Charge: 2}}
	if err := CheckHits(good, 5, 400); err != nil {
		t.Fatalf("good hits: %v", err)
	}
	cases := []struct {
		name string
		hits []pmt.Hit
		want string
	}{
		{"sensor below", []pmt.Hit{{Sensor: -1, Time: 1, Charge: 1}}, "hits[0].Sensor = -1"},
		{"sensor above", []pmt.Hit{{Sensor: 0, Time: 1, Charge: 1}, {Sensor: 5, Time: 1, Charge: 1}}, "hits[1].Sensor = 5"},
		{"NaN time", []pmt.Hit{{Sensor: 0, Time: math.NaN(), Charge: 1}}, "hits[0].Time = NaN"},
		{"Inf time", []pmt.Hit{{Sensor: 0, Time: math.Inf(-1), Charge: 1}}, "hits[0].Time = -Inf"},
		{"zero charge", []pmt.Hit{{Sensor: 0, Time: 1, Charge: 0}}, "hits[0].Charge = 0"},
		{"negative charge", []pmt.Hit{{Sensor: 0, Time: 1, Charge: -0.5}}, "hits[0].Charge = -0.5"},
		{"NaN charge", []pmt.Hit{{Sensor: 0, Time: 1, Charge: math.NaN()}}, "hits[0].Charge = NaN"},
		{"given twice", []pmt.Hit{{Sensor: 2, Time: 7, Charge: 1}, {Sensor: 4, Time: 8, Charge: 1}, {Sensor: 2, Time: 7, Charge: 1}}, "hits[0] and hits[2] are both on sensor 2"},
		{"within a gate", []pmt.Hit{{Sensor: 2, Time: 100, Charge: 1}, {Sensor: 2, Time: 7, Charge: 1}}, "hits[1] and hits[0] are both on sensor 2"},
	}
	for _, c := range cases {
		err := CheckHits(c.hits, 5, 400)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want an error containing %q", c.name, err, c.want)
		}
	}
}
