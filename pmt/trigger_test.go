package pmt

import (
	"math"
	"reflect"
	"strings"
	"testing"
)

func hitsAt(times ...float64) []Hit {
	hs := make([]Hit, len(times))
	for i, t := range times {
		hs[i] = Hit{Sensor: i, Time: t, Charge: 1}
	}
	return hs
}

func TestTriggerFind(t *testing.T) {
	// Hand-built hit lists: the trigger time is the hit completing the
	// first Threshold-in-Window group (window half-open: a span equal to
	// Window does not fire).
	tests := []struct {
		name   string
		tr     Trigger
		hits   []Hit
		wantOK bool
		wantT  float64
	}{
		{"fires on 4th of cluster", Trigger{Threshold: 4, Window: 20}, hitsAt(0, 100, 200, 205, 210, 215, 400), true, 215},
		{"N-1 in window does not fire", Trigger{Threshold: 5, Window: 20}, hitsAt(0, 100, 200, 205, 210, 215, 400), false, 0},
		{"span equal to window does not fire", Trigger{Threshold: 3, Window: 20}, hitsAt(0, 10, 20, 100), false, 0},
		{"just inside window", Trigger{Threshold: 3, Window: 20}, hitsAt(0, 10, 19.999, 100), true, 19.999},
		{"first of two clusters", Trigger{Threshold: 2, Window: 5}, hitsAt(-50, -47, 30, 31), true, -47},
		{"single hit trigger", Trigger{Threshold: 1, Window: 1}, hitsAt(7, 8), true, 7},
		{"fewer hits than threshold", Trigger{Threshold: 3, Window: 100}, hitsAt(1, 2), false, 0},
		{"no hits", Trigger{Threshold: 1, Window: 100}, nil, false, 0},
	}
	for _, tc := range tests {
		got, ok, err := tc.tr.Find(tc.hits)
		if err != nil || ok != tc.wantOK || got != tc.wantT {
			t.Errorf("%s: Find = (%v, %v, %v), want (%v, %v, nil)", tc.name, got, ok, err, tc.wantT, tc.wantOK)
		}
	}
}

func TestTriggerReadout(t *testing.T) {
	tr := Trigger{Threshold: 2, Window: 10, PreTrigger: 5, PostTrigger: 20}
	hits := hitsAt(-10, 94.9, 95, 100, 120, 120.1)
	if lo, hi := tr.ReadoutWindow(100); lo != 95 || hi != 120 {
		t.Errorf("ReadoutWindow(100) = [%v, %v], want [95, 120]", lo, hi)
	}
	got := tr.Readout(hits, 100, nil)
	if want := []Hit{hits[2], hits[3], hits[4]}; !reflect.DeepEqual(got, want) {
		t.Errorf("Readout = %v, want %v (both ends included)", got, want)
	}
}

func TestTriggerErrors(t *testing.T) {
	good := Trigger{Threshold: 3, Window: 200, PreTrigger: 500, PostTrigger: 1000}
	if err := good.Validate(); err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		tr   Trigger
		hits []Hit
		want string
	}{
		{Trigger{Threshold: 0, Window: 1}, nil, "Trigger.Threshold = 0"},
		{Trigger{Threshold: 1, Window: -1}, nil, "Trigger.Window = -1"},
		{Trigger{Threshold: 1, Window: math.NaN()}, nil, "Trigger.Window = NaN"},
		{Trigger{Threshold: 1, Window: 1, PreTrigger: -2}, nil, "Trigger.PreTrigger = -2"},
		{Trigger{Threshold: 1, Window: 1, PostTrigger: math.Inf(1)}, nil, "Trigger.PostTrigger = +Inf"},
		{good, hitsAt(1, 3, 2), "hits[2].Time = 2 is before hits[1].Time = 3"},
		{good, hitsAt(1, math.NaN()), "hits[1].Time = NaN"},
	}
	for _, tc := range tests {
		if _, ok, err := tc.tr.Find(tc.hits); err == nil || ok || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%+v: Find error = %v, want %q", tc.tr, err, tc.want)
		}
	}
}
