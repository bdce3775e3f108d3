package gen

import (
	"bytes"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// hepEvent is one parsed event, in the file's units, with every reference
// between particles and vertices resolved to slice indices.
type hepEvent struct {
	format   hepmcFormat
	number   int
	numbered bool // the E line's event number was read
	// momScale and lenScale convert the file's units to MeV and cm.
	momScale, lenScale float64
	weights            []float64
	weightNames        []string // HepMC2 N line
	process            int
	hasProcess         bool
	lab                []float64 // NuHepMC lab position (length units) [, time s]
	eventPos           [4]float64
	signalVertex       int // HepMC2 signal vertex barcode, 0 for none
	parts              []hepPart
	verts              []hepVert
}

type hepPart struct {
	id, pdg, status int
	p               [4]float64 // px, py, pz, E
	m               float64
	prod            int // index of the production vertex, -1 for none
	mother          int // Asciiv3: index of the mother particle (implicit vertex), -1 for none
	end             int // index of the vertex it enters, -1 for none or unknown
	line            int64
}

type hepVert struct {
	id, status int
	pos        [4]float64 // x, y, z, c t
	placed     bool       // pos was written
	line       int64
}

// hepLine walks the fields of one line and turns bad ones into lineErrors
// that quote the token.
type hepLine struct {
	no     int64
	record string
	fields []string
	i      int
}

func (l *hepLine) errf(format string, args ...any) error {
	return &lineError{line: l.no, msg: l.record + " line: " + fmt.Sprintf(format, args...)}
}

func (l *hepLine) left() int { return len(l.fields) - l.i }

func (l *hepLine) next(what string) (string, error) {
	if l.i >= len(l.fields) {
		return "", l.errf("%s missing (the line has %d fields)", what, len(l.fields))
	}
	l.i++
	return l.fields[l.i-1], nil
}

func (l *hepLine) int(what string) (int, error) {
	s, err := l.next(what)
	if err != nil {
		return 0, err
	}
	v, err := strconv.Atoi(s)
	if err != nil {
		return 0, l.errf("%s %q is not an integer", what, s)
	}
	return v, nil
}

func (l *hepLine) count(what string) (int, error) {
	v, err := l.int(what)
	if err == nil && v < 0 {
		err = l.errf("%s %d is negative", what, v)
	}
	return v, err
}

func (l *hepLine) float(what string) (float64, error) {
	s, err := l.next(what)
	if err != nil {
		return 0, err
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, l.errf("%s %q is not a finite number", what, s)
	}
	return v, nil
}

func (l *hepLine) end() error {
	if l.left() > 0 {
		return l.errf("unexpected %q after the last field", truncate(strings.Join(l.fields[l.i:], " ")))
	}
	return nil
}

// parseUnits reads "U MOMENTUM LENGTH" into scale factors to MeV and cm.
func parseUnits(l *hepLine, e *hepEvent) error {
	mom, err := l.next("momentum unit")
	if err != nil {
		return err
	}
	length, err := l.next("length unit")
	if err != nil {
		return err
	}
	switch mom {
	case "GEV":
		e.momScale = 1000
	case "MEV":
		e.momScale = 1
	default:
		return l.errf("momentum unit %q is not GEV or MEV", mom)
	}
	switch length {
	case "MM":
		e.lenScale = 0.1
	case "CM":
		e.lenScale = 1
	default:
		return l.errf("length unit %q is not MM or CM", length)
	}
	return l.end()
}

// parseHepMCEvent parses the text of one event; firstLine is the line
// number of its E line. The returned event is never nil, so that errors
// can name its number once read.
func parseHepMCEvent(listing *hepmcListing, text []byte, firstLine int64) (*hepEvent, error) {
	e := &hepEvent{format: listing.format, momScale: 1000, lenScale: 0.1} // HepMC defaults: GeV, mm
	p := hepParser{e: e, partIdx: map[int]int{}, vertIdx: map[int]int{}}
	lineNo := firstLine - 1
	for len(text) > 0 {
		i := bytes.IndexByte(text, '\n')
		var raw []byte
		if i >= 0 {
			raw, text = text[:i], text[i+1:]
		} else {
			raw, text = text, nil
		}
		lineNo++
		s := strings.TrimSpace(string(raw))
		if s == "" || strings.HasPrefix(s, "HepMC::") {
			continue
		}
		l := &hepLine{no: lineNo, record: s[:1], fields: strings.Fields(s[1:])}
		var err error
		if listing.format == hepmc2 {
			err = p.line2(l)
		} else {
			err = p.line3(l, s)
		}
		if err != nil {
			return e, err
		}
	}
	var err error
	if listing.format == hepmc2 {
		err = p.finish2(lineNo)
	} else {
		err = p.finish3(lineNo, listing)
	}
	return e, err
}

type hepParser struct {
	e                *hepEvent
	partIdx, vertIdx map[int]int // id or barcode -> index
	eLine            int64
	nVert, nPart     int // counts announced on the E line
	// HepMC2: particles still announced by the current V line.
	orphans, outgoing int
	// Asciiv3: incoming particle ids listed on V lines, resolved at the end.
	vertIn []vertInRef
	// Asciiv3: mother particle ids and production vertex ids of P lines,
	// resolved at the end.
	motherRef []int
}

type vertInRef struct {
	vert, id int
	line     int64
}

func (p *hepParser) line2(l *hepLine) error {
	e := p.e
	if l.record != "E" && !e.numbered {
		return l.errf("before the E line")
	}
	switch l.record {
	case "E":
		if e.numbered {
			return l.errf("a second E line in one event")
		}
		return p.event2(l)
	case "N":
		n, err := l.count("number of weight names")
		if err != nil {
			return err
		}
		names, err := quotedNames(strings.Join(l.fields[l.i:], " "))
		if err != nil {
			return l.errf("%v", err)
		}
		if len(names) != n {
			return l.errf("announces %d weight names and holds %d", n, len(names))
		}
		e.weightNames = names
	case "U":
		return parseUnits(l, e)
	case "C", "H", "F": // cross-section, heavy ion and PDF information: not used
	case "V":
		return p.vertex2(l)
	case "P":
		return p.particle2(l)
	default:
		return l.errf("unknown record")
	}
	return nil
}

// event2 reads "E number nMPI scale alphaQCD alphaQED processID
// signalVertex nVertices beam1 beam2 nRandom [random...] nWeights
// [weight...]".
func (p *hepParser) event2(l *hepLine) error {
	e := p.e
	p.eLine = l.no
	// HepMC3 3.1's HepMC2 writer, for an event without weights, ends the
	// E line with "<nRandom>N 0": an empty weight-names line glued on.
	glued := false
	if n := len(l.fields); n >= 2 && l.fields[n-1] == "0" && strings.HasSuffix(l.fields[n-2], "N") {
		l.fields = append(l.fields[:n-2:n-2], strings.TrimSuffix(l.fields[n-2], "N"))
		glued = true
	}
	var err error
	if e.number, err = l.int("event number"); err != nil {
		return err
	}
	e.numbered = true
	if _, err = l.int("number of multi-parton interactions"); err != nil {
		return err
	}
	for _, what := range []string{"event scale", "alpha_QCD", "alpha_QED"} {
		if _, err = l.float(what); err != nil {
			return err
		}
	}
	if e.process, err = l.int("signal process ID"); err != nil {
		return err
	}
	e.hasProcess = e.process != 0
	if e.signalVertex, err = l.int("signal vertex barcode"); err != nil {
		return err
	}
	if p.nVert, err = l.count("number of vertices"); err != nil {
		return err
	}
	// The beam particle barcodes are not used (HepMC3's HepMC2 writer
	// writes a barcode no particle has for the second beam).
	for _, what := range []string{"beam 1 barcode", "beam 2 barcode"} {
		if _, err = l.int(what); err != nil {
			return err
		}
	}
	nRandom, err := l.count("number of random states")
	if err != nil {
		return err
	}
	if nRandom > l.left() {
		return l.errf("announces %d random states and holds %d", nRandom, l.left())
	}
	for range nRandom {
		if _, err = l.int("random state"); err != nil {
			return err
		}
	}
	if glued && l.left() == 0 {
		return nil
	}
	nWeights, err := l.count("number of weights")
	if err != nil {
		return err
	}
	if nWeights != l.left() {
		return l.errf("announces %d weights and holds %d", nWeights, l.left())
	}
	for range nWeights {
		w, err := l.float("weight")
		if err != nil {
			return err
		}
		e.weights = append(e.weights, w)
	}
	return nil
}

// vertex2 reads "V barcode id x y z ct nOrphans nOut nWeights [weight...]".
func (p *hepParser) vertex2(l *hepLine) error {
	if err := p.closeVertex2(l.no); err != nil {
		return err
	}
	var v hepVert
	var err error
	v.line = l.no
	if v.id, err = l.int("barcode"); err != nil {
		return err
	}
	if v.status, err = l.int("id"); err != nil {
		return err
	}
	for k, what := range []string{"x", "y", "z", "c t"} {
		if v.pos[k], err = l.float(what); err != nil {
			return err
		}
	}
	v.placed = true
	if p.orphans, err = l.count("number of orphan particles"); err != nil {
		return err
	}
	if p.outgoing, err = l.count("number of outgoing particles"); err != nil {
		return err
	}
	nWeights, err := l.count("number of weights")
	if err != nil {
		return err
	}
	if nWeights != l.left() {
		return l.errf("announces %d weights and holds %d", nWeights, l.left())
	}
	for range nWeights {
		if _, err := l.float("weight"); err != nil {
			return err
		}
	}
	if prev, dup := p.vertIdx[v.id]; dup {
		return l.errf("vertex barcode %d already used on line %d", v.id, p.e.verts[prev].line)
	}
	p.vertIdx[v.id] = len(p.e.verts)
	p.e.verts = append(p.e.verts, v)
	return nil
}

// closeVertex2 checks that the current vertex got all its particles.
func (p *hepParser) closeVertex2(line int64) error {
	if p.orphans+p.outgoing > 0 {
		v := p.e.verts[len(p.e.verts)-1]
		return &lineError{line: line, msg: fmt.Sprintf("vertex %d (line %d) announces %d more particles", v.id, v.line, p.orphans+p.outgoing)}
	}
	return nil
}

// particleBody reads the fields both formats' P lines share, in the
// same order: "pdg px py pz E m status".
func (l *hepLine) particleBody(part *hepPart) error {
	var err error
	if part.pdg, err = l.int("PDG code"); err != nil {
		return err
	}
	for k, what := range []string{"px", "py", "pz", "E"} {
		if part.p[k], err = l.float(what); err != nil {
			return err
		}
	}
	if part.m, err = l.float("generated mass"); err != nil {
		return err
	}
	part.status, err = l.int("status")
	return err
}

// particle2 reads "P barcode pdg px py pz E m status theta phi endVertex
// nFlow [code index]...".
func (p *hepParser) particle2(l *hepLine) error {
	if p.orphans+p.outgoing == 0 {
		return l.errf("no V line announces this particle")
	}
	part := hepPart{prod: -1, mother: -1, end: -1, line: l.no}
	var err error
	if part.id, err = l.int("barcode"); err != nil {
		return err
	}
	if err := l.particleBody(&part); err != nil {
		return err
	}
	for _, what := range []string{"theta", "phi"} {
		if _, err = l.float(what); err != nil {
			return err
		}
	}
	if _, err = l.int("end vertex barcode"); err != nil {
		return err
	}
	nFlow, err := l.count("number of flow entries")
	if err != nil {
		return err
	}
	if 2*nFlow != l.left() {
		return l.errf("announces %d flow entries and holds %d numbers", nFlow, l.left())
	}
	for range 2 * nFlow {
		if _, err = l.int("flow"); err != nil {
			return err
		}
	}
	cur := len(p.e.verts) - 1
	if p.orphans > 0 {
		p.orphans--
		part.end = cur
	} else {
		p.outgoing--
		part.prod = cur
	}
	if prev, dup := p.partIdx[part.id]; dup {
		return l.errf("particle barcode %d already used on line %d", part.id, p.e.parts[prev].line)
	}
	p.partIdx[part.id] = len(p.e.parts)
	p.e.parts = append(p.e.parts, part)
	return nil
}

func (p *hepParser) finish2(lastLine int64) error {
	e := p.e
	if !e.numbered {
		return &lineError{line: lastLine, msg: "event without an E line"}
	}
	if err := p.closeVertex2(lastLine); err != nil {
		return err
	}
	if len(e.verts) != p.nVert {
		return &lineError{line: p.eLine, msg: fmt.Sprintf("E line: announces %d vertices, the event has %d", p.nVert, len(e.verts))}
	}
	if len(e.weightNames) > 0 && len(e.weightNames) != len(e.weights) {
		return &lineError{line: p.eLine, msg: fmt.Sprintf("E line: %d weights for %d weight names", len(e.weights), len(e.weightNames))}
	}
	if e.signalVertex != 0 {
		if _, ok := p.vertIdx[e.signalVertex]; !ok {
			return &lineError{line: p.eLine, msg: fmt.Sprintf("E line: signal vertex barcode %d is not a vertex of the event", e.signalVertex)}
		}
	}
	return nil
}

func (p *hepParser) line3(l *hepLine, text string) error {
	e := p.e
	if l.record != "E" && !e.numbered {
		return l.errf("before the E line")
	}
	switch l.record {
	case "E":
		if e.numbered {
			return l.errf("a second E line in one event")
		}
		return p.event3(l)
	case "U":
		return parseUnits(l, e)
	case "W":
		for l.left() > 0 {
			w, err := l.float("weight")
			if err != nil {
				return err
			}
			e.weights = append(e.weights, w)
		}
	case "A":
		return p.attribute3(l, text)
	case "V":
		return p.vertex3(l, text)
	case "P":
		return p.particle3(l)
	default:
		return l.errf("unknown record")
	}
	return nil
}

// event3 reads "E number nVertices nParticles [@ x y z ct]".
func (p *hepParser) event3(l *hepLine) error {
	e := p.e
	p.eLine = l.no
	var err error
	if e.number, err = l.int("event number"); err != nil {
		return err
	}
	e.numbered = true
	if p.nVert, err = l.count("number of vertices"); err != nil {
		return err
	}
	if p.nPart, err = l.count("number of particles"); err != nil {
		return err
	}
	if l.left() > 0 {
		if at, _ := l.next("@"); at != "@" {
			return l.errf("%q where the event position's \"@\" or the end of the line belongs", at)
		}
		for k, what := range []string{"x", "y", "z", "c t"} {
			if e.eventPos[k], err = l.float(what); err != nil {
				return err
			}
		}
	}
	return l.end()
}

// attribute3 reads "A id name value": the event attributes (id 0) that
// NuHepMC defines; other attributes are not used.
func (p *hepParser) attribute3(l *hepLine, text string) error {
	e := p.e
	id, err := l.int("attribute owner id")
	if err != nil {
		return err
	}
	name, err := l.next("attribute name")
	if err != nil {
		return err
	}
	if id != 0 {
		return nil
	}
	switch name {
	case "signal_process_id", "ProcID", "ProcId":
		if e.process, err = l.int(name); err != nil {
			return err
		}
		e.hasProcess = true
		return l.end()
	case "lab_pos", "LabPos":
		if n := l.left(); n != 3 && n != 4 {
			return l.errf("%s has %d values, want x y z or x y z t", name, n)
		}
		e.lab = e.lab[:0]
		for l.left() > 0 {
			v, err := l.float(name)
			if err != nil {
				return err
			}
			e.lab = append(e.lab, v)
		}
	}
	return nil
}

// vertex3 reads "V id status [in,in,...] [@ x y z ct]".
func (p *hepParser) vertex3(l *hepLine, text string) error {
	v := hepVert{line: l.no}
	var err error
	if v.id, err = l.int("vertex id"); err != nil {
		return err
	}
	if v.id >= 0 {
		return l.errf("vertex id %d is not negative", v.id)
	}
	if v.status, err = l.int("status"); err != nil {
		return err
	}
	rest := strings.Join(l.fields[l.i:], " ")
	if !strings.HasPrefix(rest, "[") {
		return l.errf("%q where the list of incoming particles \"[...]\" belongs", truncate(rest))
	}
	close := strings.IndexByte(rest, ']')
	if close < 0 {
		return l.errf("list of incoming particles %q has no closing \"]\"", truncate(rest))
	}
	vi := len(p.e.verts)
	if list := strings.TrimSpace(rest[1:close]); list != "" {
		for _, tok := range strings.Split(list, ",") {
			tok = strings.TrimSpace(tok)
			id, err := strconv.Atoi(tok)
			if err != nil || id <= 0 {
				return l.errf("incoming particle id %q is not a positive integer", tok)
			}
			p.vertIn = append(p.vertIn, vertInRef{vert: vi, id: id, line: l.no})
		}
	}
	pos := &hepLine{no: l.no, record: "V", fields: strings.Fields(rest[close+1:])}
	if pos.left() > 0 {
		if at, _ := pos.next("@"); at != "@" {
			return pos.errf("%q where the position's \"@\" or the end of the line belongs", at)
		}
		for k, what := range []string{"x", "y", "z", "c t"} {
			if v.pos[k], err = pos.float(what); err != nil {
				return err
			}
		}
		v.placed = true
		if err := pos.end(); err != nil {
			return err
		}
	}
	if prev, dup := p.vertIdx[v.id]; dup {
		return l.errf("vertex id %d already used on line %d", v.id, p.e.verts[prev].line)
	}
	p.vertIdx[v.id] = vi
	p.e.verts = append(p.e.verts, v)
	return nil
}

// particle3 reads "P id mother pdg px py pz E m status"; mother is a
// vertex id (< 0), a particle id (> 0: the particle comes from that
// particle's end vertex, not written) or 0 (no production vertex).
func (p *hepParser) particle3(l *hepLine) error {
	part := hepPart{prod: -1, mother: -1, end: -1, line: l.no}
	var err error
	if part.id, err = l.int("particle id"); err != nil {
		return err
	}
	if part.id <= 0 {
		return l.errf("particle id %d is not positive", part.id)
	}
	mother, err := l.int("mother id")
	if err != nil {
		return err
	}
	if err := l.particleBody(&part); err != nil {
		return err
	}
	if err := l.end(); err != nil {
		return err
	}
	if prev, dup := p.partIdx[part.id]; dup {
		return l.errf("particle id %d already used on line %d", part.id, p.e.parts[prev].line)
	}
	p.partIdx[part.id] = len(p.e.parts)
	p.e.parts = append(p.e.parts, part)
	p.motherRef = append(p.motherRef, mother)
	return nil
}

func (p *hepParser) finish3(lastLine int64, listing *hepmcListing) error {
	e := p.e
	if !e.numbered {
		return &lineError{line: lastLine, msg: "event without an E line"}
	}
	implicit := 0 // vertices not written: the end vertices of mother particles
	seen := map[int]bool{}
	for i, ref := range p.motherRef {
		part := &e.parts[i]
		switch {
		case ref < 0:
			v, ok := p.vertIdx[ref]
			if !ok {
				return &lineError{line: part.line, msg: fmt.Sprintf("P line: mother vertex %d is not in the event", ref)}
			}
			part.prod = v
		case ref > 0:
			m, ok := p.partIdx[ref]
			if !ok {
				return &lineError{line: part.line, msg: fmt.Sprintf("P line: mother particle %d is not in the event", ref)}
			}
			if m == i {
				return &lineError{line: part.line, msg: fmt.Sprintf("P line: particle %d is its own mother", ref)}
			}
			part.mother = m
			if !seen[m] {
				seen[m] = true
				implicit++
			}
		}
	}
	for _, in := range p.vertIn {
		k, ok := p.partIdx[in.id]
		if !ok {
			return &lineError{line: in.line, msg: fmt.Sprintf("V line: incoming particle %d is not in the event", in.id)}
		}
		if e.parts[k].end >= 0 && e.parts[k].end != in.vert {
			return &lineError{line: in.line, msg: fmt.Sprintf("V line: particle %d already enters vertex %d", in.id, e.verts[e.parts[k].end].id)}
		}
		e.parts[k].end = in.vert
	}
	if len(e.parts) != p.nPart {
		return &lineError{line: p.eLine, msg: fmt.Sprintf("E line: announces %d particles, the event has %d", p.nPart, len(e.parts))}
	}
	if nv := len(e.verts) + implicit; nv != p.nVert {
		return &lineError{line: p.eLine, msg: fmt.Sprintf("E line: announces %d vertices, the event has %d (%d written, %d implied by mother particles)",
			p.nVert, nv, len(e.verts), implicit)}
	}
	if n := len(listing.weightNames); n > 0 && len(e.weights) > 0 && len(e.weights) != n {
		return &lineError{line: p.eLine, msg: fmt.Sprintf("W line: %d weights for the %d weight names of the run information", len(e.weights), n)}
	}
	return nil
}

// quotedNames splits `"a" "b c"` into its quoted strings.
func quotedNames(s string) ([]string, error) {
	var names []string
	for {
		s = strings.TrimSpace(s)
		if s == "" {
			return names, nil
		}
		if s[0] != '"' {
			return nil, fmt.Errorf("weight name %q is not quoted", truncate(s))
		}
		end := strings.IndexByte(s[1:], '"')
		if end < 0 {
			return nil, fmt.Errorf("weight name %q has no closing quote", truncate(s))
		}
		names = append(names, s[1:1+end])
		s = s[end+2:]
	}
}
