package gen

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"sort"
	"strings"

	"github.com/golang/geo/r3"
	"go-hep.org/x/hep/hepmc"

	"github.com/conelight/conelight/sim/phys"
)

// HepMCOptions are the options of a HepMC event-file generator.
type HepMCOptions struct {
	// Vertex, if set, overrides the file's vertices: each event is moved
	// so that its primary vertex (the signal vertex, else the vertex of
	// barcode closest to 0) lands on a point drawn from Vertex, keeping
	// the displacements of the other vertices.
	Vertex VertexDist
	// Time is added to the file's vertex times (ns); with Vertex set, the
	// primary vertex is at Time.
	Time float64
}

// HepMC reads primaries from a HepMC2 ASCII event file (IO_GenEvent, and
// the older IO_Ascii and IO_ExtendedAscii listings) through go-hep's
// hepmc decoder.
//
// Events are addressed by index: construction scans the file once and
// keeps only the byte range of each event (16 bytes an event), and
// Generate(number, ...) decodes event number (0-based) afresh from the
// io.ReaderAt. Memory stays bounded whatever the file size, any event can
// be made in any order by any goroutine, and the simulator's result does
// not depend on the order in which workers ask for events.
//
// Final-state particles (status 1) the simulator tracks (e-, e+, mu-, mu+,
// gamma) become primaries, in barcode order; the others (neutrinos,
// hadrons, nuclei, unknown codes) are counted in Info.Skipped. Momenta are
// converted to kinetic energy (MeV, from |p| and the PDG mass) and
// direction, vertex positions to cm and vertex times (c t, in length
// units) to ns. Units follow the event's "U" line when there is one (IO_GenEvent);
// otherwise HepMC2's defaults, GeV and mm, apply.
//
// HepMC is immutable and safe for concurrent use if the io.ReaderAt is
// (os.File and bytes.Reader are).
type HepMC struct {
	name   string
	r      io.ReaderAt
	closer io.Closer
	events []hepmcRange
	format []string // START line of each listing
	opts   HepMCOptions
}

type hepmcRange struct {
	off     int64
	n       int32 // length in bytes
	listing int32 // index into format
}

// maxHepMCLine is the longest line accepted, newline included: the go-hep
// decoder reads lines with a bufio.Scanner, whose default limit is
// bufio.MaxScanTokenSize (64 KiB).
const maxHepMCLine = 60000

const (
	hepmcStartGenEvent = "HepMC::IO_GenEvent-START_EVENT_LISTING"
	hepmcStartASCII    = "HepMC::IO_Ascii-START_EVENT_LISTING"
	hepmcStartExtASCII = "HepMC::IO_ExtendedAscii-START_EVENT_LISTING"
)

// OpenHepMC opens the HepMC2 file at path; Close releases it.
func OpenHepMC(path string, opts HepMCOptions) (*HepMC, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("gen: %w", err)
	}
	st, err := f.Stat()
	if err != nil {
		f.Close()
		return nil, fmt.Errorf("gen: %w", err)
	}
	h, err := NewHepMC(f, st.Size(), path, opts)
	if err != nil {
		f.Close()
		return nil, err
	}
	h.closer = f
	return h, nil
}

// ReadHepMC reads a whole HepMC2 stream (for example a decompressed one)
// into memory and indexes it; name is used in messages and String.
func ReadHepMC(r io.Reader, name string, opts HepMCOptions) (*HepMC, error) {
	b, err := io.ReadAll(r)
	if err != nil {
		return nil, fmt.Errorf("gen: reading %s: %w", name, err)
	}
	return NewHepMC(bytes.NewReader(b), int64(len(b)), name, opts)
}

// NewHepMC indexes the size bytes of HepMC2 text in r; name is used in
// messages and String. The scan checks the listing structure (START and
// END lines, E lines inside a listing, line lengths); the content of each
// event is decoded, and checked, when it is generated.
func NewHepMC(r io.ReaderAt, size int64, name string, opts HepMCOptions) (*HepMC, error) {
	if opts.Vertex.set() {
		if err := opts.Vertex.Validate(); err != nil {
			return nil, fmt.Errorf("gen: HepMCOptions.Vertex: %w", err)
		}
	}
	if !isFinite(opts.Time) {
		return nil, fmt.Errorf("gen: HepMCOptions.Time = %g must be finite", opts.Time)
	}
	h := &HepMC{name: name, r: r, opts: opts}
	if err := h.scan(io.NewSectionReader(r, 0, size)); err != nil {
		return nil, err
	}
	if len(h.events) == 0 {
		return nil, fmt.Errorf("gen: %s: no events", name)
	}
	return h, nil
}

// scan records the byte range of every event.
func (h *HepMC) scan(r io.Reader) error {
	br := bufio.NewReaderSize(r, 1<<16)
	var off int64
	lineNo := 0
	inListing := false
	cur := -1 // index of the open event
	closeEvent := func(end int64) error {
		if cur >= 0 {
			n := end - h.events[cur].off
			if n > math.MaxInt32 {
				return fmt.Errorf("gen: %s: event %d is %d bytes long", h.name, cur, n)
			}
			h.events[cur].n = int32(n)
			cur = -1
		}
		return nil
	}
	for {
		line, err := br.ReadSlice('\n')
		if err == bufio.ErrBufferFull || len(line) > maxHepMCLine {
			return fmt.Errorf("gen: %s line %d: longer than %d bytes", h.name, lineNo+1, maxHepMCLine)
		}
		if len(line) == 0 && err == io.EOF {
			break
		}
		lineNo++
		start := off
		off += int64(len(line))
		text := strings.TrimSpace(string(line))
		switch {
		case strings.HasPrefix(text, "HepMC::") && strings.HasSuffix(text, "-START_EVENT_LISTING"):
			if inListing {
				return fmt.Errorf("gen: %s line %d: %s inside an open listing", h.name, lineNo, text)
			}
			if text != hepmcStartGenEvent && text != hepmcStartASCII && text != hepmcStartExtASCII {
				return fmt.Errorf("gen: %s line %d: unsupported listing %q", h.name, lineNo, text)
			}
			inListing = true
			h.format = append(h.format, text)
		case strings.HasPrefix(text, "HepMC::") && strings.HasSuffix(text, "-END_EVENT_LISTING"):
			if !inListing {
				return fmt.Errorf("gen: %s line %d: %s without a START line", h.name, lineNo, text)
			}
			if err := closeEvent(start); err != nil {
				return err
			}
			inListing = false
		case strings.HasPrefix(text, "HepMC::"): // e.g. HepMC::Version
		case text == "":
		case inListing && (text == "E" || strings.HasPrefix(text, "E ")):
			if err := closeEvent(start); err != nil {
				return err
			}
			h.events = append(h.events, hepmcRange{off: start, listing: int32(len(h.format) - 1)})
			cur = len(h.events) - 1
		case !inListing:
			return fmt.Errorf("gen: %s line %d: %q outside an event listing", h.name, lineNo, truncate(text))
		case cur < 0:
			return fmt.Errorf("gen: %s line %d: %q before the first E line", h.name, lineNo, truncate(text))
		}
		if err == io.EOF {
			break
		}
		if err != nil {
			return fmt.Errorf("gen: reading %s: %w", h.name, err)
		}
	}
	if inListing {
		return fmt.Errorf("gen: %s: no END_EVENT_LISTING line (truncated file?)", h.name)
	}
	return nil
}

func truncate(s string) string {
	if len(s) > 40 {
		return s[:40] + "..."
	}
	return s
}

// Len returns the number of events in the file.
func (h *HepMC) Len() int { return len(h.events) }

// Close closes the file opened by OpenHepMC; it does nothing otherwise.
func (h *HepMC) Close() error {
	if h.closer == nil {
		return nil
	}
	return h.closer.Close()
}

// String describes the source, e.g. "HepMC2 file run1.hepmc (2 events)".
func (h *HepMC) String() string {
	s := fmt.Sprintf("HepMC2 file %s (%d events)", h.name, len(h.events))
	if h.opts.Vertex.set() {
		s += fmt.Sprintf("; vertex %v", h.opts.Vertex)
	}
	if h.opts.Time != 0 {
		s += fmt.Sprintf("; t + %g ns", h.opts.Time)
	}
	return s
}

// Generate decodes event number (0-based index in the file). rng is used
// only to draw the overriding vertex, if any, and the direction of a
// massive particle at rest.
func (h *HepMC) Generate(number uint64, rng *rand.Rand, dst []phys.Particle) ([]phys.Particle, Info, error) {
	dst = dst[:0]
	if number >= uint64(len(h.events)) {
		return dst, Info{}, fmt.Errorf("gen: %s: event %d requested, the file has %d", h.name, number, len(h.events))
	}
	ev := h.events[number]
	fail := func(err error) ([]phys.Particle, Info, error) {
		return dst[:0], Info{}, fmt.Errorf("gen: %s event %d (line %d): %w", h.name, number, h.lineOf(ev.off), err)
	}
	if rng == nil && h.opts.Vertex.set() {
		return fail(errors.New("rng is nil and HepMCOptions.Vertex needs it"))
	}
	buf := make([]byte, ev.n)
	if n, err := h.r.ReadAt(buf, ev.off); n < len(buf) {
		return fail(err)
	}
	format := h.format[ev.listing]
	evt, err := decodeHepMC(format, buf)
	if err != nil {
		return fail(err)
	}
	// Units: go-hep reads the U line of IO_GenEvent; without one (or in
	// the older listings) HepMC2's defaults GeV and mm hold.
	momScale, lenScale := 1000.0, 0.1 // to MeV, to cm
	if format == hepmcStartGenEvent && hasUnitsLine(buf) {
		if evt.MomentumUnit == hepmc.MEV {
			momScale = 1
		}
		if evt.LengthUnit == hepmc.CM {
			lenScale = 1
		}
	}
	dst, info, err := h.convert(evt, momScale, lenScale, rng, dst)
	if err != nil {
		return fail(err)
	}
	return dst, info, nil
}

// lineOf returns the line number (1-based) of the byte at offset off, for
// error messages: it counts the newlines before it, so it costs a read of
// the file up to off and is used only on the error path.
func (h *HepMC) lineOf(off int64) int {
	line := 1
	buf := make([]byte, 1<<16)
	for pos := int64(0); pos < off; {
		n, err := h.r.ReadAt(buf[:min(int64(len(buf)), off-pos)], pos)
		line += bytes.Count(buf[:n], []byte{'\n'})
		pos += int64(n)
		if n == 0 || (err != nil && err != io.EOF) {
			break
		}
	}
	return line
}

// hasUnitsLine reports whether the event text has a "U" line.
func hasUnitsLine(b []byte) bool {
	for len(b) > 0 {
		i := bytes.IndexByte(b, '\n')
		line := b
		if i >= 0 {
			line, b = b[:i], b[i+1:]
		} else {
			b = nil
		}
		line = bytes.TrimSpace(line)
		if len(line) >= 2 && line[0] == 'U' && (line[1] == ' ' || line[1] == '\t') {
			return true
		}
	}
	return false
}

// decodeHepMC decodes one event's text with go-hep. The decoder reads
// lines in a goroutine that sends them on an unbuffered channel and ends
// after sending a final io.EOF; it also panics on some malformed input.
// So: the text is given without END line (the decoder then returns io.EOF
// only for that final message), panics are recovered into errors, and
// after the event (good or bad) the decoder is drained until io.EOF, so
// that no goroutine is left blocked.
func decodeHepMC(start string, text []byte) (evt *hepmc.Event, err error) {
	in := io.MultiReader(strings.NewReader(start+"\n"), bytes.NewReader(text))
	dec := hepmc.NewDecoder(in)
	decode := func(e *hepmc.Event) (err error) {
		defer func() {
			if r := recover(); r != nil {
				err = fmt.Errorf("malformed event (decoder panic: %v)", r)
			}
		}()
		return dec.Decode(e)
	}
	evt = new(hepmc.Event)
	err = decode(evt)
	done := err == io.EOF
	if err == io.EOF {
		err = errors.New("malformed event: it ends before all its vertices and particles are read")
	}
	for !done {
		// Every call consumes at least one line; only the final message
		// gives io.EOF (the text has no END line; lines are shorter than
		// the scanner's limit). A well-formed event leaves nothing but
		// the final message.
		done = decode(new(hepmc.Event)) == io.EOF
		if !done && err == nil {
			err = errors.New("malformed event: lines left after its last vertex")
		}
	}
	if err != nil {
		return nil, err
	}
	return evt, nil
}

// convert turns the decoded event into primaries.
func (h *HepMC) convert(evt *hepmc.Event, momScale, lenScale float64, rng *rand.Rand, dst []phys.Particle) ([]phys.Particle, Info, error) {
	info := Info{SourceEvent: evt.EventNumber}
	barcodes := make([]int, 0, len(evt.Particles))
	for bc := range evt.Particles {
		barcodes = append(barcodes, bc)
	}
	sort.Ints(barcodes)

	vertexPos := func(v *hepmc.Vertex) (r3.Vector, float64) {
		if v == nil {
			return r3.Vector{}, 0
		}
		p := v.Position.P4
		return r3.Vector{X: p.X * lenScale, Y: p.Y * lenScale, Z: p.Z * lenScale}, p.T * lenScale / phys.SpeedOfLight
	}
	var shift r3.Vector
	tShift := h.opts.Time
	if h.opts.Vertex.set() {
		ref := evt.SignalVertex
		if ref == nil {
			for _, v := range evt.Vertices {
				if ref == nil || abs(v.Barcode) < abs(ref.Barcode) || (abs(v.Barcode) == abs(ref.Barcode) && v.Barcode < ref.Barcode) {
					ref = v
				}
			}
		}
		refPos, refT := vertexPos(ref)
		shift = h.opts.Vertex.Sample(rng).Sub(refPos)
		tShift -= refT
	}
	for _, bc := range barcodes {
		p := evt.Particles[bc]
		if p.Status != 1 {
			continue
		}
		pdg := int(p.PdgID)
		if int64(pdg) != p.PdgID || !tracked(pdg) {
			info.Skipped++
			switch abs(pdg) {
			case phys.ElectronNeu, phys.MuonNeu, 16: // 16: nu_tau
				info.SkippedNeutrinos++
			}
			continue
		}
		sp, _ := phys.Lookup(pdg)
		m := p.Momentum.P4
		mom := r3.Vector{X: m.X * momScale, Y: m.Y * momScale, Z: m.Z * momScale}
		if !finiteVector(mom) {
			return dst, info, fmt.Errorf("particle barcode %d: momentum %v is not finite", bc, mom)
		}
		pos, t := vertexPos(p.ProdVertex)
		if !finiteVector(pos) || !isFinite(t) {
			return dst, info, fmt.Errorf("particle barcode %d: vertex %v, t = %g ns is not finite", bc, pos, t)
		}
		pm := mom.Norm()
		ekin := phys.KineticFromMomentum(pm, sp.Mass)
		if !isFinite(ekin) {
			// |p| or E overflows: components beyond about 1e154 MeV.
			return dst, info, fmt.Errorf("particle barcode %d: momentum %v gives kinetic energy %g MeV", bc, mom, ekin)
		}
		var dir r3.Vector
		switch {
		case pm > 0:
			dir = mom.Mul(1 / pm)
		case sp.Mass > 0 && rng == nil:
			return dst, info, fmt.Errorf("particle barcode %d: %s at rest needs a random direction, and rng is nil", bc, sp.Name)
		case sp.Mass > 0: // at rest: any direction
			dir = Isotropic().Sample(rng)
		default:
			return dst, info, fmt.Errorf("particle barcode %d: %s with zero momentum", bc, sp.Name)
		}
		out := phys.Particle{PDG: pdg, Pos: pos.Add(shift), Time: t + tShift, Dir: dir, Ekin: ekin}
		if !finiteVector(out.Pos) || !isFinite(out.Time) {
			return dst, info, fmt.Errorf("particle barcode %d: vertex %v, t = %g ns after the shift is not finite", bc, out.Pos, out.Time)
		}
		dst = append(dst, out)
	}
	return dst, info, nil
}

func abs(i int) int {
	if i < 0 {
		return -i
	}
	return i
}

var _ Generator = (*HepMC)(nil)
