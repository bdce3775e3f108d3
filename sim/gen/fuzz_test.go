package gen

import (
	"bytes"
	"math"
	"math/rand/v2"
	"os"
	"regexp"
	"runtime"
	"testing"
)

// hepmcErrorForm is the form of every HepMC error: the file's name and
// then a line (with the event index and the file's event number once
// known), or a whole-file condition.
var hepmcErrorForm = regexp.MustCompile(`^gen: (reading )?fuzz\.hepmc( line [0-9]+( \(event [0-9]+(, number -?[0-9]+ in the file)?\))?| \(event [0-9]+\))?: `)

// FuzzHepMC reads arbitrary bytes as a HepMC file and generates every
// event it indexes (up to 16). Nothing may panic, every error names the
// file (and the line and event), every primary produced is finite with a
// unit direction, and the memory allocated stays within a fixed amount
// plus a multiple of the input's size, whatever counts the input claims.
func FuzzHepMC(f *testing.F) {
	good, err := os.ReadFile(hepmcFile)
	if err != nil {
		f.Fatal(err)
	}
	f.Add(good)
	for _, cut := range []int{len(good) / 3, len(good) / 2, len(good) - 40} {
		f.Add(good[:cut])
	}
	f.Add(bytes.Replace(good, []byte("P 3 13 1.0000000000000000e-01"), []byte("P 3 13 1e200"), 1))
	f.Add(bytes.Replace(good, []byte("P 3 13 1.0000000000000000e-01 2.0000000000000000e-01 5.0000000000000000e-01 5.5782048394918149e-01"),
		[]byte("P 3 13 0 0 0 0.1056583755"), 1)) // a muon at rest
	f.Add(bytes.Replace(good, []byte("V -1 0 1.0000000000000000e+02"), []byte("V -1 0 inf"), 1))
	f.Add([]byte("HepMC::IO_Ascii-START_EVENT_LISTING\nE 1 2 3\nHepMC::IO_Ascii-END_EVENT_LISTING\n"))
	f.Add([]byte("HepMC::IO_GenEvent-START_EVENT_LISTING\nE\nE\nHepMC::IO_GenEvent-END_EVENT_LISTING\n"))
	for _, name := range []string{"nuhepmc_v1_gev_mm.hepmc3", "hepmc2_noweights_gev_mm.hepmc"} {
		b, err := os.ReadFile(hepmc3Dir + name)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
	f.Add([]byte("HepMC::Asciiv3-START_EVENT_LISTING\nE 1 100000000 100000000\nHepMC::Asciiv3-END_EVENT_LISTING\n"))
	var ms runtime.MemStats
	f.Fuzz(func(t *testing.T, data []byte) {
		runtime.ReadMemStats(&ms)
		before := ms.TotalAlloc
		defer func() {
			runtime.ReadMemStats(&ms)
			if alloc := ms.TotalAlloc - before; alloc > hepmcAllocLimit(len(data)) {
				t.Fatalf("%d bytes of input allocated %d bytes", len(data), alloc)
			}
		}()
		h, err := ReadHepMC(bytes.NewReader(data), "fuzz.hepmc", HepMCOptions{})
		if err != nil {
			if !hepmcErrorForm.MatchString(err.Error()) {
				t.Fatalf("error %q does not name the file and line", err)
			}
			return
		}
		rng := rand.New(rand.NewPCG(1, 2))
		for number := range uint64(min(h.Len(), 16)) {
			ps, _, err := h.Generate(number, rng, nil)
			if err != nil {
				if !hepmcErrorForm.MatchString(err.Error()) {
					t.Fatalf("event %d: error %q does not name the file and event", number, err)
				}
				continue
			}
			for i, p := range ps {
				if !finiteVector(p.Pos) || !finiteVector(p.Dir) || !isFinite(p.Time) || !isFinite(p.Ekin) || p.Ekin < 0 {
					t.Fatalf("event %d primary %d not finite: %+v", number, i, p)
				}
				if n := p.Dir.Norm(); math.Abs(n-1) > 1e-12 {
					t.Fatalf("event %d primary %d direction norm %v", number, i, n)
				}
			}
		}
	})
}

// hepmcAllocLimit bounds the memory reading and generating every event of
// n bytes of HepMC text may allocate: the scan's line buffer, and then
// per event its text and its parsed fields, a small multiple of its size.
func hepmcAllocLimit(n int) uint64 { return 2<<20 + 200*uint64(n) }
