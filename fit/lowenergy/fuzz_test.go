package lowenergy_test

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/internal/fuzzhits"
	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim"
)

// FuzzFit feeds the low-energy fitter arbitrary hit lists: it must never
// panic, and a result marked converged must be finite throughout.
func FuzzFit(f *testing.F) {
	cfg, err := sim.DemoConfig(3)
	if err != nil {
		f.Fatal(err)
	}
	fitter, err := lowenergy.New(lowenergy.Config{Setup: cfg.Setup})
	if err != nil {
		f.Fatal(err)
	}
	// Seeds: two simulated events and a few hand-made oddities.
	evs := study(f, cfg, fitter, 10, 100, 0, 2)
	for _, ev := range evs {
		f.Add(fuzzhits.Encode(ev.hits))
	}
	f.Add(fuzzhits.Encode([]pmt.Hit{{Sensor: 0, Time: 1, Charge: 1}}))
	f.Add(fuzzhits.Encode([]pmt.Hit{{Sensor: 3, Time: math.NaN(), Charge: 1}, {Sensor: 4, Time: 2, Charge: math.Inf(1)}}))
	f.Add(fuzzhits.Encode([]pmt.Hit{{Sensor: -1, Time: 0, Charge: 0}, {Sensor: 1 << 30, Time: 0, Charge: 0}}))
	f.Add([]byte{})
	f.Fuzz(func(t *testing.T, b []byte) {
		hits := fuzzhits.Decode(b)
		if len(hits) > 2000 {
			hits = hits[:2000]
		}
		r, err := fitter.Fit(hits)
		if err != nil || r.Status != fit.Converged {
			return
		}
		vals := []float64{r.Track.Vertex.X, r.Track.Vertex.Y, r.Track.Vertex.Z, r.Track.Time, r.Track.Dir.X, r.Track.Dir.Y, r.Track.Dir.Z, r.Track.Ekin,
			r.Errors.Vertex.X, r.Errors.Vertex.Y, r.Errors.Vertex.Z, r.Errors.Time, r.Errors.Angle[0], r.Errors.Angle[1], r.Errors.Ekin, r.LogLikelihood}
		for i, v := range vals {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("converged result has non-finite value %d: %+v", i, r)
			}
		}
	})
}

// minimalTables is a small valid table file.
const minimalTables = "name tiny\ntank 100 120\ntts 0\nmeta seed 3\n" +
	"residual 2\n-1 0 0.5\n0 1 0.5\n" +
	"direction 2\n-1 0 0.2\n0 1 0.8\n" +
	"energy 2\n5 100 10 1 50\n10 200 15 2 50\n"

// FuzzReadTables feeds the table parser arbitrary files: it must never
// panic, and tables it accepts are valid and survive a write and a read
// unchanged. Seeds: the embedded sets and small files that exercise each
// keyword and each error.
func FuzzReadTables(f *testing.F) {
	for _, name := range lowenergy.EmbeddedTableNames() {
		b, err := os.ReadFile(filepath.Join("data", name+".txt"))
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
	f.Add([]byte(minimalTables))
	for _, s := range []string{
		"",
		"# only a comment\n\n",
		"bogus 1\n",
		"residual 2\n0 1 1\n",
		"residual 99999999\n",
		"residual -1\n",
		"tank NaN 1\n",
		"name a\nname b\n",
		minimalTables + "energy 1\n20 300 20 3 50\n",
		strings.Replace(minimalTables, "50\n10", "-50\n10", 1),
		strings.Replace(minimalTables, "1 0.5\n0 1", "1e300 0.5\n1e300 1e301", 1),
		strings.Replace(minimalTables, "0 1 0.8", "0 2 0.8", 1),
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, b []byte) {
		tb, err := lowenergy.ReadTables(bytes.NewReader(b))
		if err != nil {
			return
		}
		if err := tb.Validate(); err != nil {
			t.Fatalf("ReadTables returned tables that do not validate: %v", err)
		}
		var buf bytes.Buffer
		if err := lowenergy.WriteTables(&buf, tb); err != nil {
			t.Fatalf("WriteTables refused tables ReadTables accepted: %v", err)
		}
		back, err := lowenergy.ReadTables(bytes.NewReader(buf.Bytes()))
		if err != nil {
			t.Fatalf("ReadTables refused what WriteTables wrote: %v\n%s", err, buf.Bytes())
		}
		if !reflect.DeepEqual(tb, back) {
			t.Fatalf("write and read changed the tables:\n%+v\n%+v", tb, back)
		}
	})
}
