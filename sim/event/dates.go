package event

import (
	"encoding/binary"
	"fmt"
	"os"
	"strconv"
	"time"

	"go-hep.org/x/hep/groot/rbase"
	"go-hep.org/x/hep/groot/rbytes"
)

// Reproducible dates.
//
// groot stamps every record of a ROOT file (each key header, the copies
// of the key headers in the directory's key list, the directory's
// creation and modification times) with the time of writing, so two runs
// with the same seed and settings would differ in bytes. The writer
// restamps them all with one date: the time in the environment variable
// SOURCE_DATE_EPOCH (seconds since 1970, the reproducible-builds
// convention) when it is set, else 1995-01-01 00:00:00 UTC, the earliest
// date a ROOT TDatime can hold.

// sourceDateEpoch is the environment variable that sets the date.
const sourceDateEpoch = "SOURCE_DATE_EPOCH"

// recordDate returns the date to stamp, packed as a ROOT TDatime.
func recordDate() (uint32, error) {
	t := time.Date(1995, 1, 1, 0, 0, 0, 0, time.UTC)
	if s, ok := os.LookupEnv(sourceDateEpoch); ok {
		sec, err := strconv.ParseInt(s, 10, 64)
		if err != nil {
			return 0, fmt.Errorf("%s = %q is not a whole number of seconds", sourceDateEpoch, s)
		}
		t = time.Unix(sec, 0).UTC()
		if t.Year() < 1995 || t.Year() > 1995+63 {
			return 0, fmt.Errorf("%s = %q (%s) is outside the years 1995-2058 a ROOT date can hold", sourceDateEpoch, s, t.Format(time.DateOnly))
		}
	}
	return datime(t), nil
}

// datime packs t as a ROOT TDatime, with groot's encoder.
func datime(t time.Time) uint32 {
	dt := rbase.Datime(t)
	w := rbytes.NewWBuffer(nil, nil, 0, nil)
	dt.MarshalROOT(w)
	return binary.BigEndian.Uint32(w.Bytes())
}

// ROOT record layout (big-endian): a key header starts with Nbytes
// (int32; a negative value marks a free gap of that many bytes), version
// (int16, above 1000 for 64-bit seek fields), ObjLen (int32), Datime
// (uint32), KeyLen (int16), ...; the class name follows the two seek
// fields.
const (
	keyDatimeOffset = 10
	keyLenOffset    = 14
	keyFixedSmall   = 26 // bytes before the class name with 32-bit seeks
	keyFixedBig     = 34 // with 64-bit seeks
)

// rootBegin is the position of a ROOT file's first record (fBEGIN).
const rootBegin = 100

// stampRecords sets the date of every record header in [from, to) of f
// to d; from must be the start of a record (records are chained by their
// lengths, and groot leaves reserved space after the first one, so only
// rootBegin is certain). With keyList set, the key headers listed in a TDirectory record
// (the directory's key list) are stamped too. It returns an error for a
// record chain that does not fit the range: the writer's own output
// should always fit.
func stampRecords(f *os.File, from, to int64, d uint32, keyList bool) error {
	be := binary.BigEndian
	var hdr [keyFixedBig + 256]byte
	for pos := from; pos < to; {
		want := min(int64(len(hdr)), to-pos)
		n, err := f.ReadAt(hdr[:want], pos)
		if int64(n) < want || want < 4 {
			return fmt.Errorf("record at %d: short read (%v)", pos, err)
		}
		nbytes := int64(int32(be.Uint32(hdr[0:])))
		if nbytes < 0 {
			pos -= nbytes
			continue
		}
		if nbytes < keyFixedSmall || pos+nbytes > to || n < keyFixedSmall+1 {
			return fmt.Errorf("record at %d: length %d does not fit [%d, %d)", pos, nbytes, from, to)
		}
		if _, err := f.WriteAt(be.AppendUint32(nil, d), pos+keyDatimeOffset); err != nil {
			return err
		}
		if keyList {
			fixed := keyFixedSmall
			if be.Uint16(hdr[4:]) > 1000 {
				fixed = keyFixedBig
			}
			if cl := int(hdr[fixed]); fixed+1+cl <= n && string(hdr[fixed+1:fixed+1+cl]) == "TDirectory" {
				keylen := int64(be.Uint16(hdr[keyLenOffset:]))
				if err := stampKeyList(f, pos+keylen, pos+nbytes, d); err != nil {
					return fmt.Errorf("key list at %d: %w", pos, err)
				}
			}
		}
		pos += nbytes
	}
	return nil
}

// stampKeyList stamps the key headers of a directory's key list, which
// fills [from, to): a key count (int32) and the headers.
func stampKeyList(f *os.File, from, to int64, d uint32) error {
	be := binary.BigEndian
	var b [4]byte
	if _, err := f.ReadAt(b[:], from); err != nil {
		return err
	}
	nkeys := int64(int32(be.Uint32(b[:])))
	pos := from + 4
	for i := int64(0); i < nkeys; i++ {
		var h [keyLenOffset + 2]byte
		if pos+int64(len(h)) > to {
			return fmt.Errorf("key %d of %d beyond the record", i, nkeys)
		}
		if _, err := f.ReadAt(h[:], pos); err != nil {
			return err
		}
		if _, err := f.WriteAt(be.AppendUint32(nil, d), pos+keyDatimeOffset); err != nil {
			return err
		}
		keylen := int64(be.Uint16(h[keyLenOffset:]))
		if keylen < keyFixedSmall {
			return fmt.Errorf("key %d: header length %d", i, keylen)
		}
		pos += keylen
	}
	return nil
}

// stampFile stamps every date of the closed ROOT file at path: all
// records, the key lists, and the creation and modification times of the
// top directory.
func stampFile(path string, d uint32) error {
	f, err := os.OpenFile(path, os.O_RDWR, 0)
	if err != nil {
		return err
	}
	defer f.Close()
	be := binary.BigEndian
	var h [64]byte
	if _, err := f.ReadAt(h[:], 0); err != nil {
		return fmt.Errorf("file header: %w", err)
	}
	if string(h[:4]) != "root" {
		return fmt.Errorf("file header: no ROOT magic")
	}
	version := be.Uint32(h[4:])
	begin := int64(be.Uint32(h[8:]))
	var end, nbytesName int64
	if version < 1000000 {
		end, nbytesName = int64(be.Uint32(h[12:])), int64(be.Uint32(h[28:]))
	} else {
		end, nbytesName = int64(be.Uint64(h[12:])), int64(be.Uint32(h[36:]))
	}
	if err := stampRecords(f, begin, end, d, true); err != nil {
		return err
	}
	// The top directory's record: version (int16), ctime, mtime.
	dt := be.AppendUint32(nil, d)
	if _, err := f.WriteAt(append(dt, dt...), begin+nbytesName+2); err != nil {
		return err
	}
	return f.Close()
}
