#!/bin/sh
# Builds the offline page: one self-contained HTML file with the engine
# compiled to WebAssembly (gzipped, base64-encoded, inlined), the Go
# distribution's wasm_exec.js (copied from the Go that builds the engine,
# never a committed copy), the page script and styles.
#
# Usage: scripts/build-page.sh [OUTPUT]    (default: site/dist/rootshift.html,
# which package site embeds; rebuild rootshift afterwards for `rootshift page`).
set -eu
cd "$(dirname "$0")/.."
out=${1:-site/dist/rootshift.html}
case $out in /*) ;; *) out=$PWD/$out ;; esac
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT INT TERM
# satconv and signext (WebAssembly features of every current browser) make
# float-to-integer conversions and sign extensions single instructions.
GOWASM=satconv,signext GOOS=js GOARCH=wasm go build -trimpath -ldflags=-s -o "$tmp/rootshift.wasm" ./wasm
cp "$(go env GOROOT)/lib/wasm/wasm_exec.js" "$tmp/wasm_exec.js"
raw=$(wc -c <"$tmp/rootshift.wasm" | tr -d ' ')
gzip -9 -n -c "$tmp/rootshift.wasm" >"$tmp/rootshift.wasm.gz"
mkdir -p "$(dirname "$out")"
go run ./site/internal/assemble -wasm "$tmp/rootshift.wasm.gz" -raw-size "$raw" -exec "$tmp/wasm_exec.js" -o "$out"
