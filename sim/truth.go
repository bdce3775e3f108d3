package sim

import (
	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
)

// Generator truth in the event file.
//
// A generator reports what it made in a gen.Info; the event file keeps
// the generator-agnostic part of it, event.Interaction (incoming
// neutrino with its total energy Etot and unit direction Dir, target,
// Q2, process ID in the NuHepMC numbering, event weight, outgoing
// nucleon, the event's number in the generator's file), in the same
// words for the built-in generators and for generator files.
// InteractionTruth is the one place where one becomes the other.
//
// A generator that reads its events from a file says so by implementing
// SourceGenerator: its events then record their number in the file
// (Interaction.FromFile, SourceEvent), and WriteRun stores the run's
// accounting of the file (events read, events left out and why: empty,
// or bad and skipped, as Run reports them) in the run record
// (event.RunInfo.Source). The run keeps the account, not the generator:
// only the run knows which events it handed on, in order.

// SourceGenerator is a generator that reads its events from a file
// (HepMC, NuHepMC).
type SourceGenerator interface {
	gen.Generator
	// SourceFile names the file the events are read from.
	SourceFile() string
}

// Process IDs in the NuHepMC numbering (Gardiner, Isaacson, Pickering,
// arXiv:2310.13211, convention for the process ID ranges): 200-299
// quasi-elastic, charged current in X00-X49.
const processCCQE = 200

// InteractionTruth returns the interaction record of an event made by
// generator g with truth info: the zero Interaction for an event with no
// neutrino that did not come from a file (a particle gun).
func InteractionTruth(g gen.Generator, info gen.Info) event.Interaction {
	_, fromFile := g.(SourceGenerator)
	if info.Neutrino == 0 && !fromFile {
		return event.Interaction{}
	}
	in := event.Interaction{
		PDG:     info.Neutrino,
		Etot:    info.NeutrinoEtot,
		Dir:     info.NeutrinoDir,
		Target:  info.Target,
		Q2:      info.Q2,
		Weight:  1, // unweighted unless the file gives a weight
		Nucleon: info.FinalNucleon,
	}
	switch {
	case info.Process != 0:
		in.Process = info.Process
	case info.Reaction == gen.CCQE:
		in.Process = processCCQE
	}
	if info.HasWeight {
		in.Weight = info.Weight
	}
	if fromFile {
		in.FromFile, in.SourceEvent = true, int64(info.SourceEvent)
	}
	return in
}
