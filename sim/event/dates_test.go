package event

import (
	"bytes"
	"strings"
	"testing"
	"time"

	"go-hep.org/x/hep/groot/rbase"
	"go-hep.org/x/hep/groot/rbytes"
	"go-hep.org/x/hep/groot/riofs"
)

// TestReproducibleBytes: the same events written to the same path at
// different times give the same bytes (groot would stamp each record with
// the time of writing).
func TestReproducibleBytes(t *testing.T) {
	if testing.Short() {
		t.Skip("waits over a second for the clock to move")
	}
	t.Setenv(sourceDateEpoch, "")
	unsetenv(t, sourceDateEpoch)
	s := smallSetup(t)
	path := tempPath(t, "same.root")
	events := randomEvents(5, 0, 5, s.det.NumSensors(), 8)
	writeFile(t, path, s, testRun(0, 5), events)
	a := readFileBytes(t, path)
	time.Sleep(1100 * time.Millisecond) // ROOT dates have one-second steps
	writeFile(t, path, s, testRun(0, 5), events)
	if b := readFileBytes(t, path); !bytes.Equal(a, b) {
		t.Errorf("two writes of the same events differ in bytes")
	}
}

// TestSourceDateEpoch: every key carries the date SOURCE_DATE_EPOCH sets,
// as groot reads it back; a bad value is refused naming the variable.
func TestSourceDateEpoch(t *testing.T) {
	s := smallSetup(t)
	path := tempPath(t, "dated.root")
	t.Setenv(sourceDateEpoch, "1700000000") // 2023-11-14 22:13:20 UTC
	writeFile(t, path, s, testRun(0, 3), randomEvents(5, 0, 3, s.det.NumSensors(), 8))
	f, err := riofs.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	want := time.Unix(1700000000, 0).UTC()
	data := readFileBytes(t, path)
	for _, k := range f.Keys() {
		// groot does not return a key's date: decode the header field.
		var dt rbase.Datime
		if err := dt.UnmarshalROOT(rbytes.NewRBuffer(data[k.SeekKey()+keyDatimeOffset:], nil, 0, nil)); err != nil {
			t.Fatal(err)
		}
		if !dt.Time().Equal(want) {
			t.Errorf("key %s dated %v, want %v", k.Name(), dt.Time(), want)
		}
	}
	for _, bad := range []string{"yesterday", "0", "-5"} {
		t.Setenv(sourceDateEpoch, bad)
		_, err := Create(tempPath(t, "bad.root"), s.det, s.model, testRun(0, 1))
		if err == nil || !strings.Contains(err.Error(), sourceDateEpoch+` = "`+bad+`"`) {
			t.Errorf("SOURCE_DATE_EPOCH=%s: error %v", bad, err)
		}
	}
}
