#!/usr/bin/env bash
# regen.sh builds writer.cc against the HepMC3 library (Debian package
# libhepmc3-dev) and writes the test files into this directory.
# regen.sh --check writes them into a temporary directory instead and fails
# if they differ from the committed files (used by .ci/run).
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT
c++ -std=c++11 -O1 -o "$work/writer" "$here/writer.cc" -lHepMC3
if [ "${1:-}" = "--check" ]; then
	mkdir "$work/out"
	"$work/writer" "$work/out"
	status=0
	for f in "$work"/out/*; do
		if ! cmp -s "$f" "$here/$(basename "$f")"; then
			echo "regen.sh: $(basename "$f") differs from the committed file:"
			diff "$here/$(basename "$f")" "$f" | head -20 || true
			status=1
		fi
	done
	[ $status -eq 0 ] && echo "regen.sh: the HepMC3 library reproduces the committed files"
	exit $status
fi
"$work/writer" "$here"
