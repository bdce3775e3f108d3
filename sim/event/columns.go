package event

import (
	"encoding/binary"
	"fmt"
	"hash/crc32"
	"math"
	"reflect"

	"go-hep.org/x/hep/groot/rtree"
)

// column is one branch of a tree: its name, a pointer to the Go variable
// that holds the value of the current entry and, for a variable-length
// array, the name of the branch holding its length. The same table drives
// writing, reading, checksumming and comparing, so the four cannot drift
// apart.
type column struct {
	name  string
	ptr   any // *int32, *int64, *uint32, *uint64, *float64, *bool, *string, *[]int32, *[]uint64 or *[]float64
	count string
}

// checksumBranch is the last branch of every tree: the CRC-32C of the
// entry's other columns (see checksum).
const checksumBranch = "crc32c"

var castagnoli = crc32.MakeTable(crc32.Castagnoli)

func writeVars(cols []column, crc *uint32) []rtree.WriteVar {
	vars := make([]rtree.WriteVar, 0, len(cols)+1)
	for _, c := range cols {
		vars = append(vars, rtree.WriteVar{Name: c.name, Value: c.ptr, Count: c.count})
	}
	return append(vars, rtree.WriteVar{Name: checksumBranch, Value: crc})
}

func readVars(cols []column, crc *uint32) []rtree.ReadVar {
	vars := make([]rtree.ReadVar, 0, len(cols)+1)
	for _, c := range cols {
		vars = append(vars, rtree.ReadVar{Name: c.name, Value: c.ptr})
	}
	return append(vars, rtree.ReadVar{Name: checksumBranch, Value: crc})
}

// checksum returns the CRC-32C of the columns' current values, each
// encoded little-endian in table order (strings and slices preceded by
// their length), using buf as scratch space and returning it for reuse.
// It lets the reader detect corruption that the ROOT container does not
// (a flipped bit in an uncompressed or unchecked basket).
func checksum(cols []column, buf []byte) (uint32, []byte) {
	le := binary.LittleEndian
	var crc uint32
	buf = buf[:0]
	for _, c := range cols {
		switch p := c.ptr.(type) {
		case *int32:
			buf = le.AppendUint32(buf, uint32(*p))
		case *uint32:
			buf = le.AppendUint32(buf, *p)
		case *int64:
			buf = le.AppendUint64(buf, uint64(*p))
		case *uint64:
			buf = le.AppendUint64(buf, *p)
		case *float64:
			buf = le.AppendUint64(buf, math.Float64bits(*p))
		case *bool:
			if *p {
				buf = append(buf, 1)
			} else {
				buf = append(buf, 0)
			}
		case *string:
			buf = le.AppendUint64(buf, uint64(len(*p)))
			buf = append(buf, *p...)
		case *[]int32:
			buf = le.AppendUint64(buf, uint64(len(*p)))
			for _, v := range *p {
				buf = le.AppendUint32(buf, uint32(v))
			}
		case *[]uint64:
			buf = le.AppendUint64(buf, uint64(len(*p)))
			for _, v := range *p {
				buf = le.AppendUint64(buf, v)
			}
		case *[]float64:
			buf = le.AppendUint64(buf, uint64(len(*p)))
			for _, v := range *p {
				buf = le.AppendUint64(buf, math.Float64bits(v))
			}
		default:
			panic(fmt.Sprintf("event: column %q has unsupported type %T", c.name, c.ptr)) // programming error in a table below
		}
		// Hash in pieces so that buf stays small for large slices.
		if len(buf) >= 1<<14 {
			crc = crc32.Update(crc, castagnoli, buf)
			buf = buf[:0]
		}
	}
	return crc32.Update(crc, castagnoli, buf), buf
}

// firstDifference compares the current values of two tables built by the
// same function and returns a description of the first column that
// differs ("" if none). Columns named in skip are ignored.
func firstDifference(a, b []column, skip ...string) string {
next:
	for i, ca := range a {
		for _, s := range skip {
			if ca.name == s {
				continue next
			}
		}
		va := reflect.ValueOf(ca.ptr).Elem()
		vb := reflect.ValueOf(b[i].ptr).Elem()
		if va.Kind() != reflect.Slice {
			if !va.Equal(vb) {
				return fmt.Sprintf("%s: %v vs %v", ca.name, va, vb)
			}
			continue
		}
		if va.Len() != vb.Len() {
			return fmt.Sprintf("len(%s): %d vs %d", ca.name, va.Len(), vb.Len())
		}
		for j := range va.Len() {
			if !va.Index(j).Equal(vb.Index(j)) {
				return fmt.Sprintf("%s[%d]: %v vs %v", ca.name, j, va.Index(j), vb.Index(j))
			}
		}
	}
	return ""
}

// resize returns s with length n, reusing its storage when it is large
// enough.
func resize[T any](s []T, n int) []T {
	if cap(s) < n {
		return make([]T, n)
	}
	return s[:n]
}
