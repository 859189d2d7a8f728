#!/bin/sh
# Runs the numerical packages' tests compiled to WebAssembly (GOOS=js
# GOARCH=wasm) under Node.js, with the Go distribution's exec wrapper
# $(go env GOROOT)/lib/wasm/go_js_wasm_exec. -short keeps the heavier
# simulation checks out. Tests that start other programs (python3 and the
# like) skip under js/wasm. Extra arguments go to `go test`.
#
# Usage: scripts/wasm-test.sh [go test flags] [packages]   (default: ./core/ ./breaks/ ./wasm/...)
set -eu
cd "$(dirname "$0")/.."
exec_script="$(go env GOROOT)/lib/wasm/go_js_wasm_exec"
if [ ! -x "$exec_script" ]; then
	echo "wasm-test: $exec_script not found (Go distribution without lib/wasm?)" >&2
	exit 2
fi
if ! command -v node >/dev/null 2>&1; then
	echo "wasm-test: node not found; install Node.js (v18 or later)" >&2
	exit 2
fi
pkgs=""
flags=""
for a in "$@"; do
	case $a in
	./*|github.com/*) pkgs="$pkgs $a" ;;
	*) flags="$flags $a" ;;
	esac
done
[ -n "$pkgs" ] || pkgs="./core/ ./breaks/ ./wasm/..."
# The wasm test binaries are large and single-threaded: give them time.
# shellcheck disable=SC2086
GOOS=js GOARCH=wasm go test -exec="$exec_script" -short -timeout 20m $flags $pkgs
