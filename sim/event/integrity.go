package event

import (
	"bufio"
	"errors"
	"fmt"
	"hash/crc32"
	"io"
	"strconv"
	"strings"
	"sync"

	"go-hep.org/x/hep/groot/rbase"
	"go-hep.org/x/hep/groot/riofs"
)

// File integrity.
//
// groot decodes tree baskets in a background goroutine, and a damaged
// basket can make it panic there, where no recover in this package can
// reach; a flipped bit in an uncompressed basket would even be read
// silently. So every byte a tree is read from is checked before groot sees
// it. The writer notes the byte region holding the trees (everything
// between the file's directory record, written by groot.Create, and the
// records groot appends when the file is closed), computes a CRC-32C of
// each fixed-size chunk of it, and stores these with the trees' record
// positions in a TObjString named "integrity", written after the region
// and protected by its own CRC. The reader passes the file through a
// guardedFile that, once the integrity record is loaded, refuses any read
// outside the region and verifies each chunk the first time it is touched.
// Reading a range of events therefore checks only the chunks it needs.

const (
	integrityKey     = "integrity"
	integrityHeader  = "conelight-integrity 1"
	defaultChunkSize = 1 << 20 // bytes per checksummed chunk
)

// integrity is the content of the integrity record.
type integrity struct {
	begin, end int64            // the checked region [begin, end)
	chunk      int64            // chunk size, bytes
	crcs       []uint32         // CRC-32C of each chunk, the last one possibly short
	keys       map[string]int64 // record position of each tree
}

func (in *integrity) text() string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s\nregion %d %d\nchunk %d\n", integrityHeader, in.begin, in.end, in.chunk)
	for _, name := range [...]string{runTree, detectorTree, sensorTree, eventsTree} {
		fmt.Fprintf(&b, "key %s %d\n", name, in.keys[name])
	}
	for _, c := range in.crcs {
		fmt.Fprintf(&b, "crc %08x\n", c)
	}
	fmt.Fprintf(&b, "self %08x\n", crc32.Checksum([]byte(b.String()), castagnoli))
	return b.String()
}

func parseIntegrity(s string) (*integrity, error) {
	i := strings.LastIndex(s, "self ")
	if i < 0 {
		return nil, fmt.Errorf("no self checksum")
	}
	if got := fmt.Sprintf("self %08x\n", crc32.Checksum([]byte(s[:i]), castagnoli)); s[i:] != got {
		return nil, fmt.Errorf("self checksum mismatch")
	}
	in := &integrity{keys: map[string]int64{}}
	sc := bufio.NewScanner(strings.NewReader(s[:i]))
	if !sc.Scan() || sc.Text() != integrityHeader {
		return nil, fmt.Errorf("header is not %q", integrityHeader)
	}
	for sc.Scan() {
		if err := in.parseLine(strings.Fields(sc.Text())); err != nil {
			return nil, fmt.Errorf("line %q: %w", sc.Text(), err)
		}
	}
	if in.chunk <= 0 || in.begin < 0 || in.end < in.begin ||
		int64(len(in.crcs)) != (in.end-in.begin+in.chunk-1)/in.chunk {
		return nil, fmt.Errorf("inconsistent region [%d, %d), chunk %d, %d checksums", in.begin, in.end, in.chunk, len(in.crcs))
	}
	return in, nil
}

func (in *integrity) parseLine(f []string) error {
	var err error
	switch {
	case len(f) == 3 && f[0] == "region":
		if in.begin, err = strconv.ParseInt(f[1], 10, 64); err == nil {
			in.end, err = strconv.ParseInt(f[2], 10, 64)
		}
	case len(f) == 2 && f[0] == "chunk":
		in.chunk, err = strconv.ParseInt(f[1], 10, 64)
	case len(f) == 3 && f[0] == "key":
		in.keys[f[1]], err = strconv.ParseInt(f[2], 10, 64)
	case len(f) == 2 && f[0] == "crc":
		var v uint64
		v, err = strconv.ParseUint(f[1], 16, 32)
		in.crcs = append(in.crcs, uint32(v))
	default:
		err = errors.New("not understood")
	}
	return err
}

// chunkSums computes the chunk checksums of region [begin, end) of r.
func chunkSums(r io.ReaderAt, begin, end, chunk int64) ([]uint32, error) {
	var crcs []uint32
	buf := make([]byte, min(chunk, end-begin))
	for off := begin; off < end; off += chunk {
		b := buf[:min(chunk, end-off)]
		if _, err := r.ReadAt(b, off); err != nil {
			return nil, err
		}
		crcs = append(crcs, crc32.Checksum(b, castagnoli))
	}
	return crcs, nil
}

// putIntegrity computes and stores the integrity record of the file being
// written, whose trees all lie in [begin, end) of the file on disk at path
// r.
func putIntegrity(f *riofs.File, r io.ReaderAt, begin, end, chunk int64) error {
	crcs, err := chunkSums(r, begin, end, chunk)
	if err != nil {
		return fmt.Errorf("integrity checksums: %w", err)
	}
	in := &integrity{begin: begin, end: end, chunk: chunk, crcs: crcs, keys: map[string]int64{}}
	for _, k := range f.Keys() {
		in.keys[k.Name()] = k.SeekKey()
	}
	return f.Put(integrityKey, rbase.NewObjString(in.text()))
}

// guardedFile is the riofs.Reader the event reader hands to groot. Until
// guard is called it passes reads through; afterwards it serves only the
// checked region, verifying each chunk on first use. It is safe for the
// concurrent use groot's basket prefetching makes of it.
type guardedFile struct {
	src riofs.Reader

	mu       sync.Mutex
	in       *integrity // nil until guard
	verified []bool
	buf      []byte
}

var errOutsideRegion = errors.New("read outside the checksummed region")

func (g *guardedFile) Read(p []byte) (int, error) {
	g.mu.Lock()
	guarded := g.in != nil
	g.mu.Unlock()
	if guarded {
		return 0, errOutsideRegion
	}
	return g.src.Read(p)
}

func (g *guardedFile) Close() error { return g.src.Close() }

func (g *guardedFile) ReadAt(p []byte, off int64) (int, error) {
	if err := g.check(off, int64(len(p))); err != nil {
		return 0, err
	}
	return g.src.ReadAt(p, off)
}

// guard switches to checked reading with the given integrity record.
func (g *guardedFile) guard(in *integrity) {
	g.mu.Lock()
	defer g.mu.Unlock()
	g.in = in
	g.verified = make([]bool, len(in.crcs))
}

// check verifies the chunks overlapping [off, off+n).
func (g *guardedFile) check(off, n int64) error {
	g.mu.Lock()
	defer g.mu.Unlock()
	in := g.in
	if in == nil || n == 0 {
		return nil
	}
	if off < in.begin || off > in.end-n {
		return fmt.Errorf("%w: bytes [%d, %d) outside [%d, %d)", errOutsideRegion, off, off+n, in.begin, in.end)
	}
	for c := (off - in.begin) / in.chunk; c <= (off+n-1-in.begin)/in.chunk; c++ {
		if g.verified[c] {
			continue
		}
		lo := in.begin + c*in.chunk
		hi := min(lo+in.chunk, in.end)
		g.buf = resize(g.buf, int(hi-lo))
		buf := g.buf
		if _, err := g.src.ReadAt(buf, lo); err != nil {
			return fmt.Errorf("checksummed chunk %d (bytes %d to %d): %w", c, lo, hi, err)
		}
		if sum := crc32.Checksum(buf, castagnoli); sum != in.crcs[c] {
			return fmt.Errorf("checksum mismatch in bytes %d to %d (stored %08x, computed %08x): file corrupt", lo, hi, in.crcs[c], sum)
		}
		g.verified[c] = true
	}
	return nil
}

// loadIntegrity reads the integrity record of f, checks the trees' record
// positions against it and switches g to checked reading.
func loadIntegrity(f *riofs.File, g *guardedFile) error {
	obj, err := f.Get(integrityKey)
	if err != nil {
		return fmt.Errorf("no integrity record (not a conelight event file?): %w", err)
	}
	s, ok := obj.(*rbase.ObjString)
	if !ok {
		return fmt.Errorf("integrity record is a %s, not a TObjString", obj.Class())
	}
	in, err := parseIntegrity(s.String())
	if err != nil {
		return fmt.Errorf("integrity record: %w", err)
	}
	found := 0
	for _, k := range f.Keys() {
		want, ok := in.keys[k.Name()]
		if !ok {
			continue
		}
		if k.SeekKey() != want || want < in.begin || want >= in.end {
			return fmt.Errorf("record of %q at byte %d, integrity record says %d in [%d, %d): file corrupt",
				k.Name(), k.SeekKey(), want, in.begin, in.end)
		}
		found++
	}
	if found != len(in.keys) || len(in.keys) != 4 {
		return fmt.Errorf("%d of the %d tree records listed in the integrity record found: file corrupt", found, len(in.keys))
	}
	g.guard(in)
	return nil
}
