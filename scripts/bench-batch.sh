#!/usr/bin/env bash
# Batch benchmark (issue "Batch runs"): 10,000 simulated series of length 300
# through the default battery and the verdict, on all cores. Prints series
# per second and peak memory (the command's own summary line).
set -euo pipefail
cd "$(dirname "$0")/.."
N=${N:-10000}
T=${T:-300}
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
go build -o "$tmp/rootshift" ./cmd/rootshift
go run ./breaks/batch/cmd/gendata -n "$N" -t "$T" > "$tmp/series.jsonl"
echo "input: $N series of length $T ($(du -h "$tmp/series.jsonl" | cut -f1)), $(nproc) cores"
"$tmp/rootshift" batch --jsonl -o "$tmp/out.jsonl" "$tmp/series.jsonl" 2>&1 | grep -v '^\s*$' | tail -3
echo "output: $(wc -l < "$tmp/out.jsonl") records, $(du -h "$tmp/out.jsonl" | cut -f1)"
