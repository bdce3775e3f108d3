package main

import (
	"bytes"
	_ "embed"
	"flag"
	"fmt"
	"strings"
	"text/template"
)

// Batch job templates: the production's own command line, minus -shard,
// -out and -batch, filled into a job-array script whose index is the
// shard. They write beside the submit directory.
var (
	//go:embed slurm.sh.tmpl
	slurmTemplate string
	//go:embed htcondor.sub.tmpl
	htcondorTemplate string
)

var batchTemplates = map[string]string{"slurm": slurmTemplate, "htcondor": htcondorTemplate}

// batchScript returns the job script of the named batch system for the
// run that fs holds: every flag set on the command line except -shard,
// -out and -batch, and -shards.
func batchScript(system string, fs *flag.FlagSet, shards int) (string, error) {
	text, ok := batchTemplates[system]
	if !ok {
		return "", fmt.Errorf("-batch = %q: want slurm or htcondor", system)
	}
	if shards < 1 {
		return "", fmt.Errorf("-shards = %d: want at least 1", shards)
	}
	var args []string
	var bad error
	fs.Visit(func(f *flag.Flag) {
		switch f.Name {
		case "shard", "out", "batch", "shards":
			return
		}
		v := f.Value.String()
		if v == "" || strings.ContainsAny(v, " \t\n\"'$\\`()") {
			bad = fmt.Errorf("-%s = %q: a job-script argument must be non-empty, without spaces, quotes or shell characters", f.Name, v)
		}
		args = append(args, "-"+f.Name, v)
	})
	if bad != nil {
		return "", bad
	}
	args = append(args, "-shards", fmt.Sprint(shards))
	var b bytes.Buffer
	err := template.Must(template.New(system).Parse(text)).Execute(&b, struct {
		Args         string
		Shards, Last int
	}{strings.Join(args, " "), shards, shards - 1})
	return b.String(), err
}
