package event

import (
	"bytes"
	"compress/zlib"
	"encoding/binary"
	"errors"
	"fmt"
	"io"
)

// preflight checks the ROOT file skeleton that groot decodes on opening,
// before groot sees it: the file header, the top directory record, the
// key list, the free-segment list and the streamer-info record. groot
// sizes its buffers from these fields, so a damaged one could make it
// allocate gigabytes and kill the process, which no recover can catch.
// Here every position and length must lie inside the file and below a
// generous cap, and the compressed streamer-info record is inflated to the
// end so that zlib verifies its Adler-32 checksum. Everything else groot
// reads is covered by the integrity record (integrity.go).
//
// Layouts: groot's riofs package documentation (file header, TKey) and the
// ROOT file format it describes; all integers big-endian.
func preflight(r io.ReaderAt, size int64) error {
	var hdr [64 + 12]byte
	if size < int64(len(hdr)) {
		return fmt.Errorf("file is %d bytes, too short for a ROOT file header: truncated?", size)
	}
	if _, err := r.ReadAt(hdr[:], 0); err != nil {
		return fmt.Errorf("reading the ROOT header: %w", err)
	}
	if string(hdr[:4]) != "root" {
		return errors.New("no ROOT file signature")
	}
	h := beReader{b: hdr[4:]}
	version := h.i32()
	begin := int64(h.i32())
	big := version >= 1000000
	end := h.seek(big)
	seekFree := h.seek(big)
	nbytesFree := int64(h.i32())
	h.i32() // nfree
	nbytesName := int64(h.i32())
	h.skip(1 + 4) // units, compression
	seekInfo := h.seek(big)
	nbytesInfo := int64(h.i32())

	if end != size {
		return fmt.Errorf("file is %d bytes but its header says %d: truncated or not closed", size, end)
	}
	if begin < int64(len(hdr)) || begin >= end {
		return fmt.Errorf("first record at byte %d outside the file", begin)
	}
	if nbytesName < 10 || nbytesName > 1000 {
		return fmt.Errorf("directory name length %d out of range", nbytesName)
	}
	if err := checkSpan("free-segment list", seekFree, nbytesFree, end, seekFree == 0); err != nil {
		return err
	}
	if err := checkSpan("streamer-info record", seekInfo, nbytesInfo, end, false); err != nil {
		return err
	}

	// The top directory: its record at begin holds, after nbytesName
	// bytes of key and name, the TDirectory fields giving the key list.
	dir := make([]byte, 2+3*4+4+3*8)
	if _, err := r.ReadAt(dir, begin+nbytesName); err != nil {
		return fmt.Errorf("reading the top directory: %w", err)
	}
	d := beReader{b: dir}
	dirVersion := d.i16()
	d.skip(4 + 4) // creation and modification dates
	nbytesKeys := int64(d.i32())
	d.i32()                   // nbytes name
	d.seek(dirVersion > 1000) // seek dir
	d.seek(dirVersion > 1000) // seek parent
	seekKeys := d.seek(dirVersion > 1000)
	if err := checkSpan("key list", seekKeys, nbytesKeys, end, false); err != nil {
		return err
	}

	// The key list is stored uncompressed: key header, then the key count
	// and the keys, each at least minKeyLen bytes.
	keys, err := readKeyHeader(r, seekKeys, nbytesKeys)
	if err != nil {
		return fmt.Errorf("key list: %w", err)
	}
	if keys.keylen+keys.objlen > nbytesKeys {
		return fmt.Errorf("key list: %d + %d bytes overflow its %d-byte record", keys.keylen, keys.objlen, nbytesKeys)
	}
	if err := checkKeyList(r, seekKeys+keys.keylen, keys.objlen, end); err != nil {
		return fmt.Errorf("key list: %w", err)
	}

	if seekFree != 0 {
		if _, err := readKeyHeader(r, seekFree, nbytesFree); err != nil {
			return fmt.Errorf("free-segment list: %w", err)
		}
	}
	info, err := readKeyHeader(r, seekInfo, nbytesInfo)
	if err != nil {
		return fmt.Errorf("streamer-info record: %w", err)
	}
	if err := checkPayload(r, seekInfo+info.keylen, info.nbytes-info.keylen, info.objlen); err != nil {
		return fmt.Errorf("streamer-info record: %w", err)
	}
	return nil
}

// maxRecord caps the size of the skeleton records: ours are a few
// kilobytes; a larger value can only come from damage.
const maxRecord = 16 << 20

// checkSpan checks that [pos, pos+n) is a sane record inside the file.
func checkSpan(what string, pos, n, end int64, optional bool) error {
	if optional && n == 0 {
		return nil
	}
	if pos <= 0 || n <= 0 || n > maxRecord || pos > end-n {
		return fmt.Errorf("%s of %d bytes at byte %d does not fit in the %d-byte file", what, n, pos, end)
	}
	return nil
}

// maxObject caps the inflated size of any record, mainly the tree
// records, whose basket tables grow with the file (256 MiB is some ten
// million baskets).
const maxObject = 256 << 20

// checkKeyList checks every key of the key list payload of n bytes at pos:
// its record must lie inside the file and its object size below maxObject.
func checkKeyList(r io.ReaderAt, pos, n, end int64) error {
	buf := make([]byte, n)
	if _, err := r.ReadAt(buf, pos); err != nil {
		return err
	}
	k := beReader{b: buf}
	const minKeyLen = 30
	nkeys := int64(k.i32())
	if nkeys < 0 || nkeys*minKeyLen > n {
		return fmt.Errorf("%d keys cannot fit in %d bytes", nkeys, n)
	}
	for i := range nkeys {
		nbytes := int64(k.i32())
		version := k.i16()
		objlen := int64(k.i32())
		k.skip(4) // date
		keylen := int64(k.i16())
		k.skip(2) // cycle
		seek := k.seek(version > 1000)
		k.seek(version > 1000) // parent directory
		for range 3 {          // class, name, title
			k.str()
		}
		if k.b == nil || nbytes <= 0 || seek <= 0 || seek > end-nbytes || keylen <= 0 || keylen > nbytes ||
			objlen < 0 || objlen > maxObject {
			return fmt.Errorf("key %d: inconsistent (record of %d bytes at %d, key %d, object %d)", i, nbytes, seek, keylen, objlen)
		}
	}
	return nil
}

type keyHeader struct{ nbytes, objlen, keylen int64 }

// readKeyHeader reads the fixed part of the TKey at pos and checks its
// lengths against the record size n.
func readKeyHeader(r io.ReaderAt, pos, n int64) (keyHeader, error) {
	var b [18]byte
	if n < int64(len(b)) {
		return keyHeader{}, fmt.Errorf("record of %d bytes too short", n)
	}
	if _, err := r.ReadAt(b[:], pos); err != nil {
		return keyHeader{}, err
	}
	k := beReader{b: b[:]}
	h := keyHeader{nbytes: int64(k.i32())}
	k.i16() // version
	h.objlen = int64(k.i32())
	k.skip(4) // date
	h.keylen = int64(k.i16())
	if h.nbytes != n || h.keylen < int64(len(b)) || h.keylen > h.nbytes || h.objlen < 0 || h.objlen > 4*maxRecord {
		return keyHeader{}, fmt.Errorf("inconsistent key header at byte %d (nbytes %d of %d, key %d, object %d)", pos, h.nbytes, n, h.keylen, h.objlen)
	}
	return h, nil
}

// checkPayload verifies a record payload of n bytes at pos that holds objlen
// bytes of object: stored as is, or compressed in ROOT chunks (a 9-byte
// header: algorithm, method, compressed and inflated sizes as 3-byte
// little-endian integers). zlib chunks are inflated to their end, which
// makes zlib check their Adler-32 sums; other algorithms are refused, as
// this package writes only zlib.
func checkPayload(r io.ReaderAt, pos, n, objlen int64) error {
	if n == objlen {
		return nil
	}
	data := make([]byte, n)
	if _, err := r.ReadAt(data, pos); err != nil {
		return err
	}
	var inflated int64
	for len(data) > 0 {
		if len(data) < 9 {
			return errors.New("truncated compression header")
		}
		src := int64(data[3]) | int64(data[4])<<8 | int64(data[5])<<16
		tgt := int64(data[6]) | int64(data[7])<<8 | int64(data[8])<<16
		if string(data[:2]) != "ZL" {
			return fmt.Errorf("compression %q is not zlib", data[:2])
		}
		if src > int64(len(data)-9) {
			return fmt.Errorf("compressed chunk of %d bytes overflows the record", src)
		}
		zr, err := zlib.NewReader(bytes.NewReader(data[9 : 9+src]))
		if err != nil {
			return fmt.Errorf("zlib: %w", err)
		}
		got, err := io.Copy(io.Discard, io.LimitReader(zr, tgt+1))
		if err != nil {
			return fmt.Errorf("zlib: %w", err)
		}
		if got != tgt {
			return fmt.Errorf("zlib chunk inflates to %d bytes, header says %d", got, tgt)
		}
		inflated += tgt
		data = data[9+src:]
	}
	if inflated != objlen {
		return fmt.Errorf("inflates to %d bytes, key says %d", inflated, objlen)
	}
	return nil
}

// beReader decodes big-endian integers from a byte slice; reads past its
// end give 0 (the callers check the decoded values).
type beReader struct{ b []byte }

func (r *beReader) next(n int) []byte {
	if len(r.b) < n {
		r.b = nil
		return make([]byte, n)
	}
	p := r.b[:n]
	r.b = r.b[n:]
	return p
}

func (r *beReader) skip(n int) { r.next(n) }

// str skips a ROOT string: a length byte (255 announcing a 4-byte length)
// and the bytes.
func (r *beReader) str() {
	n := int(r.next(1)[0])
	if n == 255 {
		n = int(uint32(r.i32()))
	}
	if n > len(r.b) {
		r.b = nil
		return
	}
	r.b = r.b[n:]
}
func (r *beReader) i16() int16 { return int16(binary.BigEndian.Uint16(r.next(2))) }
func (r *beReader) i32() int32 { return int32(binary.BigEndian.Uint32(r.next(4))) }

// seek reads a file position: 8 bytes in the large-file layout, else 4.
func (r *beReader) seek(large bool) int64 {
	if large {
		return int64(binary.BigEndian.Uint64(r.next(8)))
	}
	return int64(r.i32())
}
