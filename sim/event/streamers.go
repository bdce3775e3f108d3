package event

import (
	"fmt"
	"slices"
	_ "unsafe" // go:linkname, see fileAddStreamer

	"go-hep.org/x/hep/groot/rbytes"
	"go-hep.org/x/hep/groot/rdict"
	"go-hep.org/x/hep/groot/riofs"
	"go-hep.org/x/hep/groot/rtree"
)

// Leaf streamers.
//
// A ROOT file lists in its StreamerInfo record the layout of every class
// whose objects it stores, so that a reader without compiled-in
// dictionaries can decode them. groot's tree writer (go-hep v0.36.0) stores
// TTree and TBranch there but not the leaf classes (TLeaf, TLeafI, TLeafD,
// ...), which independent readers such as jsroot then cannot decode: they
// fall back to reading every variable-length array as a scalar holding its
// first element, and lose the unsigned flag of TLeaf. ROOT itself and groot
// have these classes compiled in and read the files either way.
//
// groot has a public File.RegisterStreamer, but it skips any class that
// groot's own dictionary already knows (all the TLeaf classes), so it
// cannot add them. The shim below calls the method RegisterStreamer ends
// with, which appends a streamer to the file's list; groot then adds the
// base classes (TLeaf, TNamed) itself when the file is closed. It is the
// only use of go:linkname in the module: the build fails if a go-hep
// update renames the method, TestLeafStreamers checks the list and
// TestJSROOT that jsroot reads every branch. Upstream fix to make this file
// unnecessary: let the tree writer register its leaf classes, or let
// RegisterStreamer check the file's own list only.

//go:linkname fileAddStreamer go-hep.org/x/hep/groot/riofs.(*File).addStreamer
func fileAddStreamer(f *riofs.File, si rbytes.StreamerInfo)

// registerLeafStreamers adds to f's StreamerInfo list the streamers of the
// leaf classes of the trees, and of their base class TLeaf.
func registerLeafStreamers(f *riofs.File, trees ...rtree.Tree) error {
	// The leaves' RVersion methods report the version of their embedded
	// TLeaf, so the class is looked up by name: groot's dictionary holds
	// one version of each, the one its leaves are written with.
	classes := []string{"TLeaf"}
	for _, t := range trees {
		for _, l := range t.Leaves() {
			classes = append(classes, l.Class())
		}
	}
	for _, c := range classes {
		if slices.ContainsFunc(f.StreamerInfos(), func(si rbytes.StreamerInfo) bool { return si.Name() == c }) {
			continue
		}
		si, ok := rdict.StreamerInfos.Get(c, -1)
		if !ok {
			return fmt.Errorf("no streamer for leaf class %s in groot's dictionary", c)
		}
		fileAddStreamer(f, si)
	}
	return nil
}
