package event

import (
	"bytes"
	"encoding/json"
	"fmt"
	"maps"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"slices"
	"strconv"
	"testing"

	"go-hep.org/x/hep/groot/rtree"
)

// jsrootDir holds the jsroot interop script and its npm lock file.
var jsrootDir = filepath.Join("..", "..", "testdata", "event", "jsroot")

// jsrootRequiredEnv, when set (.ci/run sets it), turns a missing node or
// jsroot into a failure instead of a skip.
const jsrootRequiredEnv = "CONELIGHT_REQUIRE_JSROOT"

// jsrootDump is the output of testdata/event/jsroot/dump.mjs.
type jsrootDump struct {
	Reader string `json:"reader"`
	Trees  map[string]struct {
		Entries  int                          `json:"entries"`
		Branches map[string][]json.RawMessage `json:"branches"`
	} `json:"trees"`
	Objects map[string]string `json:"objects"`
}

// runJSROOT reads the ROOT file at path with jsroot in node.
func runJSROOT(t *testing.T, path string) jsrootDump {
	t.Helper()
	node, err := exec.LookPath("node")
	missing := ""
	switch {
	case err != nil:
		missing = "node is not installed"
	default:
		if _, err := os.Stat(filepath.Join(jsrootDir, "node_modules", "jsroot", "package.json")); err != nil {
			missing = "jsroot is not installed"
		}
	}
	if missing != "" {
		msg := missing + "; to run this test: (cd testdata/event/jsroot && npm ci --ignore-scripts), as .ci/run does"
		if os.Getenv(jsrootRequiredEnv) != "" {
			t.Fatalf("%s is set but %s", jsrootRequiredEnv, msg)
		}
		t.Skip(msg)
	}
	abs, err := filepath.Abs(path)
	if err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(node, "dump.mjs", abs)
	cmd.Dir = jsrootDir
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("node dump.mjs: %v\n%s", err, stderr.String())
	}
	if stderr.Len() > 0 {
		// jsroot reports what it cannot decode on the console and carries on.
		t.Errorf("jsroot complained while reading %s:\n%s", path, stderr.String())
	}
	var d jsrootDump
	dec := json.NewDecoder(bytes.NewReader(out))
	dec.UseNumber()
	if err := dec.Decode(&d); err != nil {
		t.Fatalf("jsroot output: %v", err)
	}
	return d
}

// TestJSROOT reads a freshly written event file with jsroot, an
// independent ROOT reader, and compares every branch of every tree,
// entry by entry, with the values the Go reader gets.
func TestJSROOT(t *testing.T) {
	s := smallSetup(t)
	run := testRun(500, 40)
	run.Seed = 1<<63 + 12345 // beyond 2^53: 64-bit integers must survive
	events := randomEvents(77, 500, 40, s.det.NumSensors(), 12)
	var multi, hits, nu int
	for _, e := range events {
		if len(e.Truth.Primaries) > 1 {
			multi++
		}
		if len(e.Hits) > 1 {
			hits++
		}
		if e.Truth.Interaction.PDG != 0 {
			nu++
		}
	}
	if multi == 0 || hits == 0 || nu == 0 {
		t.Fatalf("test events lack variety: %d with several primaries, %d with several hits, %d neutrinos", multi, hits, nu)
	}
	path := tempPath(t, "interop.root")
	writeFile(t, path, s, run, events)

	d := runJSROOT(t, path)
	t.Logf("read with %s", d.Reader)

	var rr runRecord
	var dr detectorRecord
	var sr sensorRecord
	var er eventRecord
	trees := map[string][]column{runTree: rr.cols(FormatVersion), detectorTree: dr.cols(), sensorTree: sr.cols(), eventsTree: er.cols(FormatVersion)}
	if got := slices.Sorted(maps.Keys(d.Trees)); !slices.Equal(got, slices.Sorted(maps.Keys(trees))) {
		t.Fatalf("jsroot found trees %v", got)
	}

	r, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	matched := 0
	highCRC := 0 // checksums with the top bit set: a signed reading would show them negative
	for name, cols := range trees {
		jt := d.Trees[name]
		var crc uint32
		all := append(slices.Clone(cols), column{name: checksumBranch, ptr: &crc})
		var names []string
		for _, c := range all {
			names = append(names, c.name)
		}
		if got := slices.Sorted(maps.Keys(jt.Branches)); !slices.Equal(got, sortedCopy(names)) {
			t.Errorf("tree %q: jsroot branches %v, want %v", name, got, names)
			continue
		}
		tree, err := r.tree(name)
		if err != nil {
			t.Fatal(err)
		}
		if jt.Entries != int(tree.Entries()) {
			t.Errorf("tree %q: jsroot reads %d entries, Go %d", name, jt.Entries, tree.Entries())
			continue
		}
		tr, err := rtree.NewReader(tree, readVars(cols, &crc))
		if err != nil {
			t.Fatal(err)
		}
		bad := map[string]bool{}
		err = tr.Read(func(ctx rtree.RCtx) error {
			for _, c := range all {
				if bad[c.name] {
					continue
				}
				if c.name == checksumBranch && crc >= 1<<31 {
					highCRC++
				}
				if msg := compareJS(c.ptr, jt.Branches[c.name][ctx.Entry]); msg != "" {
					t.Errorf("tree %q branch %s entry %d: %s", name, c.name, ctx.Entry, msg)
					bad[c.name] = true
				}
			}
			return nil
		})
		tr.Close()
		if err != nil {
			t.Fatal(err)
		}
		matched += len(all) - len(bad)
	}
	if got, want := d.Objects[integrityKey], readIntegrityText(t, r); got != want {
		t.Errorf("jsroot integrity text differs from the Go reader's")
	}
	if highCRC == 0 {
		t.Error("no checksum of 2^31 or more: the unsigned reading went untested")
	}
	t.Logf("%d branches in 4 trees matched value for value (%d events, %d checksums of 2^31 or more)", matched, len(events), highCRC)
}

// readIntegrityText is the integrity string as groot reads it.
func readIntegrityText(t *testing.T, r *Reader) string {
	t.Helper()
	obj, err := r.file.Get(integrityKey)
	if err != nil {
		t.Fatal(err)
	}
	return fmt.Sprint(obj)
}

// compareJS compares the Go value *ptr with jsroot's JSON value and
// describes the difference ("" if none). Integers compare exactly as
// decimal strings; floats as float64 (JSON keeps every double exactly
// but writes -0 as 0).
func compareJS(ptr any, raw json.RawMessage) string {
	dec := json.NewDecoder(bytes.NewReader(raw))
	dec.UseNumber()
	var js any
	if err := dec.Decode(&js); err != nil {
		return err.Error()
	}
	v := reflect.ValueOf(ptr).Elem()
	if v.Kind() == reflect.Slice {
		arr, ok := js.([]any)
		if !ok {
			return fmt.Sprintf("jsroot gives %s, not an array (Go: %v)", raw, v)
		}
		if len(arr) != v.Len() {
			return fmt.Sprintf("jsroot gives %d elements, Go %d", len(arr), v.Len())
		}
		for i := range arr {
			if msg := compareScalar(v.Index(i), arr[i]); msg != "" {
				return fmt.Sprintf("[%d]: %s", i, msg)
			}
		}
		return ""
	}
	return compareScalar(v, js)
}

func compareScalar(v reflect.Value, js any) string {
	var got string
	switch x := js.(type) {
	case json.Number:
		got = x.String()
	case string:
		got = x
	case bool:
		got = strconv.FormatBool(x)
	default:
		return fmt.Sprintf("jsroot gives %v (%T), Go %v", js, js, v)
	}
	switch v.Kind() {
	case reflect.Float64:
		f, err := strconv.ParseFloat(got, 64)
		if err != nil || f != v.Float() {
			return fmt.Sprintf("jsroot gives %s, Go %v", got, v.Float())
		}
		return ""
	case reflect.Int32, reflect.Int64:
		if want := strconv.FormatInt(v.Int(), 10); got != want {
			return fmt.Sprintf("jsroot gives %s, Go %s", got, want)
		}
	case reflect.Uint32, reflect.Uint64:
		if want := strconv.FormatUint(v.Uint(), 10); got != want {
			return fmt.Sprintf("jsroot gives %s, Go %s", got, want)
		}
	case reflect.Bool:
		if want := strconv.FormatBool(v.Bool()); got != want {
			return fmt.Sprintf("jsroot gives %s, Go %s", got, want)
		}
	case reflect.String:
		if _, ok := js.(string); !ok || got != v.String() {
			return fmt.Sprintf("jsroot gives %v, Go %q", js, v.String())
		}
	default:
		return fmt.Sprintf("unexpected Go kind %s", v.Kind())
	}
	return ""
}

func sortedCopy(s []string) []string {
	c := slices.Clone(s)
	slices.Sort(c)
	return c
}

// TestLeafStreamers checks, without node, that a written file lists the
// streamer of every leaf class its trees use and of their base TLeaf (see
// streamers.go).
func TestLeafStreamers(t *testing.T) {
	s := smallSetup(t)
	path := tempPath(t, "leaves.root")
	writeFile(t, path, s, testRun(0, 3), randomEvents(3, 0, 3, s.det.NumSensors(), 5))
	r, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	listed := map[string]bool{}
	for _, si := range r.file.StreamerInfos() {
		listed[si.Name()] = true
	}
	want := map[string]bool{"TLeaf": true}
	for _, name := range []string{runTree, detectorTree, sensorTree, eventsTree} {
		tree, err := r.tree(name)
		if err != nil {
			t.Fatal(err)
		}
		for _, l := range tree.Leaves() {
			want[l.Class()] = true
		}
	}
	for _, c := range []string{"TLeafI", "TLeafD", "TLeafL", "TLeafO", "TLeafC"} {
		if !want[c] {
			t.Errorf("no leaf of class %s: the schema changed, update this test", c)
		}
	}
	for c := range want {
		if !listed[c] {
			t.Errorf("StreamerInfo list lacks %s", c)
		}
	}
}
