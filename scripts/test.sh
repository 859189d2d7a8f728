#!/usr/bin/env bash
# Runs every test of rootshift: formatting and vet, the native Go tests
# (including the headless-Chromium tests of the offline page and the NumPy
# cross-checks), and the numerical packages again inside WebAssembly under
# node. Installs what it needs from Debian's packages on a fresh machine.
set -euo pipefail
cd "$(dirname "$0")/.."

need=()
command -v chromium >/dev/null 2>&1 || need+=(chromium)
{ python3 -c 'import numpy' || /usr/bin/python3 -c 'import numpy'; } >/dev/null 2>&1 || need+=(python3-numpy)
command -v node >/dev/null 2>&1 || need+=(nodejs)
if [ ${#need[@]} -gt 0 ]; then
  echo "== installing ${need[*]} (Debian packages)"
  if [ "$(id -u)" = 0 ]; then SUDO=""; else SUDO="sudo"; fi
  $SUDO apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq "${need[@]}" >/dev/null
fi

echo "== go version: $(go version)"
go mod download

echo "== gofmt"
unformatted=$(gofmt -l $(git ls-files '*.go' 2>/dev/null || find . -name '*.go'))
if [ -n "$unformatted" ]; then echo "gofmt would change:"; echo "$unformatted"; exit 1; fi

echo "== merge conflict markers"
if git rev-parse --git-dir >/dev/null 2>&1 && git grep -n -E '^(<<<<<<<|>>>>>>>)( |$)|^=======$' -- . ':!*.svg'; then
  echo "unresolved merge conflict markers (above)"; exit 1
fi

echo "== go vet"
go vet ./...
GOOS=js GOARCH=wasm go vet ./wasm/...

echo "== building the offline page"
bash scripts/build-page.sh

echo "== go test (native, includes headless Chromium and NumPy cross-checks)"
export ROOTSHIFT_ARTIFACTS="${ROOTSHIFT_ARTIFACTS:-$PWD/artifacts}"
mkdir -p "$ROOTSHIFT_ARTIFACTS"
go test -count=1 -timeout 40m ./... 2>&1 | tee "$ROOTSHIFT_ARTIFACTS/go-test.log"

echo "== go test inside WebAssembly (node)"
bash scripts/wasm-test.sh

echo "== all tests passed"
