package gen

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"math/rand/v2"
	"os"
	"strings"

	"github.com/conelight/conelight/sim/phys"
)

// HepMCOptions are the options of a HepMC event-file generator.
type HepMCOptions struct {
	// Vertex, if set, overrides the file's vertices: each event is moved
	// so that its primary vertex lands on a point drawn from Vertex,
	// keeping the displacements of the other vertices. Without it, an
	// event with a NuHepMC lab position is moved so that its primary
	// vertex lands there.
	Vertex VertexDist
	// Time is added to the file's vertex times (ns); with Vertex set, the
	// primary vertex is at Time.
	Time float64
}

// HepMC reads primaries from a HepMC event file: HepMC3's own text format
// (Asciiv3) and the HepMC2 text format (IO_GenEvent), including HepMC2
// files written by the HepMC3 library. NuHepMC conventions on top of
// either fill the neutrino truth of Info.
//
// Events are addressed by index: construction scans the file once and
// keeps only the byte range and first line of each event (24 bytes an
// event), and Generate(number, ...) parses event number (0-based) afresh
// from the io.ReaderAt. Memory stays bounded whatever the file size, any
// event can be made in any order by any goroutine, and the simulator's
// result does not depend on the order in which workers ask for events.
// No count written in the file (particles, vertices, weights) sizes an
// allocation: counts are compared with what the event actually holds.
//
// See the package documentation for what becomes a primary and what goes
// into Info. HepMC is immutable and safe for concurrent use if the
// io.ReaderAt is (os.File and bytes.Reader are).
type HepMC struct {
	name     string
	r        io.ReaderAt
	closer   io.Closer
	events   []hepmcRange
	listings []hepmcListing
	opts     HepMCOptions
}

type hepmcRange struct {
	off     int64
	line    int64 // line number of the E line
	n       int32 // length in bytes
	listing int32 // index into listings
}

type hepmcFormat int8

const (
	hepmc2 hepmcFormat = iota + 1 // IO_GenEvent
	hepmc3                        // Asciiv3
)

// hepmcListing is what the events of one listing share: the format and,
// for Asciiv3, the run information written before them.
type hepmcListing struct {
	format      hepmcFormat
	weightNames []string // Asciiv3 W line of the run information
}

const (
	// maxHepMCLine is the longest line accepted, newline included (the
	// HepMC3 library reads lines into a buffer of this size).
	maxHepMCLine = 1 << 18
	// maxHepMCEvent is the largest event accepted, in bytes.
	maxHepMCEvent = 1 << 28

	hepmcStartGenEvent = "HepMC::IO_GenEvent-START_EVENT_LISTING"
	hepmcEndGenEvent   = "HepMC::IO_GenEvent-END_EVENT_LISTING"
	hepmcStartAsciiv3  = "HepMC::Asciiv3-START_EVENT_LISTING"
	hepmcEndAsciiv3    = "HepMC::Asciiv3-END_EVENT_LISTING"
)

// OpenHepMC opens the HepMC file at path; Close releases it.
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

// ReadHepMC reads a whole HepMC stream (for example a decompressed one)
// into memory and indexes it; name is used in messages and String.
func ReadHepMC(r io.Reader, name string, opts HepMCOptions) (*HepMC, error) {
	b, err := io.ReadAll(r)
	if err != nil {
		return nil, fmt.Errorf("gen: reading %s: %w", name, err)
	}
	return NewHepMC(bytes.NewReader(b), int64(len(b)), name, opts)
}

// NewHepMC indexes the size bytes of HepMC text in r; name is used in
// messages and String. The scan checks the listing structure (START and
// END lines, the record letters, E lines inside a listing, line and event
// lengths); the content of each event is parsed, and checked, when it is
// generated.
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

// scan records the byte range of every event and the run information of
// every listing.
func (h *HepMC) scan(r io.Reader) error {
	br := bufio.NewReaderSize(r, maxHepMCLine)
	var off, lineNo int64
	var format hepmcFormat // of the open listing; 0 outside
	cur := -1              // index of the open event
	afterBody := false     // a V or P line was seen in the open event
	header := false        // Asciiv3 run information lines are being read
	fail := func(format string, args ...any) error {
		return fmt.Errorf("gen: %s line %d: "+format, append([]any{h.name, lineNo}, args...)...)
	}
	closeEvent := func(end int64) error {
		if cur >= 0 {
			n := end - h.events[cur].off
			if n > maxHepMCEvent {
				return fmt.Errorf("gen: %s line %d: the event starting here is %d bytes long, more than %d",
					h.name, h.events[cur].line, n, maxHepMCEvent)
			}
			h.events[cur].n = int32(n)
			cur = -1
		}
		return nil
	}
	for {
		line, err := br.ReadSlice('\n')
		if err == bufio.ErrBufferFull {
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
			if format != 0 {
				return fail("%q inside an open listing", text)
			}
			switch text {
			case hepmcStartGenEvent:
				format = hepmc2
			case hepmcStartAsciiv3:
				format = hepmc3
				header = true
			default:
				return fail("unsupported listing %q (supported: %s, %s)", text, hepmcStartAsciiv3, hepmcStartGenEvent)
			}
			h.listings = append(h.listings, hepmcListing{format: format})
		case strings.HasPrefix(text, "HepMC::") && strings.HasSuffix(text, "-END_EVENT_LISTING"):
			if format == 0 {
				return fail("%q without a START line", text)
			}
			if (format == hepmc2) != (text == hepmcEndGenEvent) || (format == hepmc3) != (text == hepmcEndAsciiv3) {
				return fail("%q closes a listing of another format", text)
			}
			if err := closeEvent(start); err != nil {
				return err
			}
			format = 0
		case strings.HasPrefix(text, "HepMC::"): // e.g. HepMC::Version
		case text == "":
		case format == 0:
			return fail("%q outside an event listing", truncate(text))
		default:
			kind := text[0]
			if len(text) > 1 && text[1] != ' ' && text[1] != '\t' {
				return fail("record %q: a record letter must be followed by a space", truncate(text))
			}
			if format == hepmc3 && (kind == 'T' || (kind == 'W' || kind == 'A') && (header || afterBody)) {
				// Asciiv3 run information: before the first event, or
				// between events (it then applies to the events after it).
				if !header {
					if err := closeEvent(start); err != nil {
						return err
					}
					h.listings = append(h.listings, hepmcListing{format: format})
					header = true
				}
				if kind == 'W' {
					l := &h.listings[len(h.listings)-1]
					l.weightNames = strings.Fields(text[1:])
				}
				continue
			}
			switch {
			case kind == 'E':
				if err := closeEvent(start); err != nil {
					return err
				}
				h.events = append(h.events, hepmcRange{off: start, line: lineNo, listing: int32(len(h.listings) - 1)})
				cur = len(h.events) - 1
				afterBody, header = false, false
			case !strings.ContainsRune(recordLetters(format), rune(kind)):
				return fail("unknown record %q in a %s listing", string(kind), format)
			case cur < 0:
				return fail("%q before the first E line", truncate(text))
			case kind == 'V' || kind == 'P':
				afterBody = true
			}
		}
		if err == io.EOF {
			break
		}
		if err != nil {
			return fmt.Errorf("gen: reading %s: %w", h.name, err)
		}
	}
	if format != 0 {
		return fmt.Errorf("gen: %s: no END_EVENT_LISTING line after line %d (truncated file?)", h.name, lineNo)
	}
	return nil
}

// recordLetters returns the record letters of a format's events.
func recordLetters(f hepmcFormat) string {
	if f == hepmc2 {
		return "ENUCHFVP"
	}
	return "EUWATVP"
}

func (f hepmcFormat) String() string {
	if f == hepmc2 {
		return "HepMC2"
	}
	return "HepMC3"
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

// String describes the source, e.g. "HepMC3 file run1.hepmc3 (2 events)".
func (h *HepMC) String() string {
	s := fmt.Sprintf("%v file %s (%d events)", h.listings[0].format, h.name, len(h.events))
	if h.opts.Vertex.set() {
		s += fmt.Sprintf("; vertex %v", h.opts.Vertex)
	}
	if h.opts.Time != 0 {
		s += fmt.Sprintf("; t + %g ns", h.opts.Time)
	}
	return s
}

// Generate parses event number (0-based index in the file). rng is used
// only to draw the overriding vertex, if any, and the direction of a
// massive particle at rest. Errors name the file, the line, the event
// index (and the event number written in the file) and quote the bad
// token.
func (h *HepMC) Generate(number uint64, rng *rand.Rand, dst []phys.Particle) ([]phys.Particle, Info, error) {
	dst = dst[:0]
	if number >= uint64(len(h.events)) {
		return dst, Info{}, fmt.Errorf("gen: %s: event %d requested, the file has %d", h.name, number, len(h.events))
	}
	ev := h.events[number]
	if rng == nil && h.opts.Vertex.set() {
		return dst, Info{}, fmt.Errorf("gen: %s line %d (event %d): rng is nil and HepMCOptions.Vertex needs it", h.name, ev.line, number)
	}
	buf := make([]byte, ev.n)
	if n, err := h.r.ReadAt(buf, ev.off); n < len(buf) {
		if err == nil {
			err = io.ErrUnexpectedEOF
		}
		return dst, Info{}, fmt.Errorf("gen: reading %s (event %d): %w", h.name, number, err)
	}
	listing := &h.listings[ev.listing]
	evt, err := parseHepMCEvent(listing, buf, ev.line)
	if err == nil {
		var info Info
		dst, info, err = h.convert(evt, listing, rng, dst)
		if err == nil {
			return dst, info, nil
		}
	}
	var le *lineError
	if errors.As(err, &le) {
		where := fmt.Sprintf("event %d", number)
		if evt != nil && evt.numbered {
			where = fmt.Sprintf("event %d, number %d in the file", number, evt.number)
		}
		return dst[:0], Info{}, fmt.Errorf("gen: %s line %d (%s): %s", h.name, le.line, where, le.msg)
	}
	return dst[:0], Info{}, fmt.Errorf("gen: %s (event %d): %w", h.name, number, err)
}

// lineError is a parse error at a line of the file.
type lineError struct {
	line int64
	msg  string
}

func (e *lineError) Error() string { return fmt.Sprintf("line %d: %s", e.line, e.msg) }

var _ Generator = (*HepMC)(nil)

// SourceFile returns the name of the file the events are read from (the
// simulator's sim.SourceGenerator: runs then record each event's number in
// the file and the run's accounting of the file).
func (h *HepMC) SourceFile() string { return h.name }
