#!/usr/bin/env bash
# The CLI against a per-candidate NumPy loop (scripts/bench-za.py): 40 random
# walks of length 1,000, `test --json --tests za --shift level+slope --lags 4`.
# Needs python3 with NumPy (Debian python3-numpy). RUNS and NUMPY set the
# number of command runs and of series the NumPy loop estimates.
set -euo pipefail
cd "$(dirname "$0")/.."
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
go build -o "$tmp/rootshift" ./cmd/rootshift
py=python3
$py -c 'import numpy' >/dev/null 2>&1 || py=/usr/bin/python3
exec $py scripts/bench-za.py --bin "$tmp/rootshift" --runs "${RUNS:-10}" --numpy "${NUMPY:-4}"
