// Tests of the page assembler. Source of every expectation: the rules
// for the offline page (one self-contained file, hash-based CSP forbidding
// every connection) and the CSP3 specification's hash source syntax
// ('sha256-' + base64 of the SHA-256 digest); common practice otherwise.
package site

import (
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"encoding/base64"
	"errors"
	"html"
	"os"
	"regexp"
	"strings"
	"testing"
)

func fakeAssets(t *testing.T) Assets {
	t.Helper()
	var gz bytes.Buffer
	w := gzip.NewWriter(&gz)
	w.Write([]byte("\x00asm fake module"))
	w.Close()
	return Assets{WasmGz: gz.Bytes(), WasmSize: 16, WasmExec: []byte("'use strict';\nglobalThis.Go = class {};\n"), Version: "0.1.0"}
}

func TestHash(t *testing.T) {
	// CSP3 hash source of "alert(1)": sha256 digest, standard base64.
	sum := sha256.Sum256([]byte("alert(1)"))
	want := "'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) + "'"
	if got := Hash("alert(1)"); got != want {
		t.Errorf("Hash = %s, want %s", got, want)
	}
	if want != "'sha256-bhHHL3z2vDgxUt0W3dWQOrprscmda2Y5pLsLg4GF+pI='" {
		t.Errorf("digest of alert(1) changed: %s", want)
	}
}

func TestAssemble(t *testing.T) {
	a := fakeAssets(t)
	out, err := Assemble(a)
	if err != nil {
		t.Fatal(err)
	}
	page := string(out)
	// The CSP meta tag, with the hash of the one executable script and of the style.
	m := regexp.MustCompile(`<meta http-equiv="Content-Security-Policy" content="([^"]+)">`).FindStringSubmatch(page)
	if m == nil {
		t.Fatal("no CSP meta tag")
	}
	csp := m[1]
	app := regexp.MustCompile(`(?s)<script>(.*?)</script>`).FindStringSubmatch(page)
	style := regexp.MustCompile(`(?s)<style>(.*?)</style>`).FindStringSubmatch(page)
	if app == nil || style == nil {
		t.Fatal("page script or style missing")
	}
	for _, want := range []string{
		"default-src 'none'", "connect-src 'none'", "worker-src blob:", "'wasm-unsafe-eval'",
		"script-src " + Hash(app[1]) + " 'wasm-unsafe-eval'", "style-src " + Hash(style[1]), "base-uri 'none'", "form-action 'none'",
	} {
		if !strings.Contains(csp, want) {
			t.Errorf("CSP lacks %q: %s", want, csp)
		}
	}
	for _, bad := range []string{"unsafe-inline", "unsafe-eval'", "http:", "https:", "*"} {
		if strings.Contains(strings.ReplaceAll(csp, "'wasm-unsafe-eval'", ""), bad) {
			t.Errorf("CSP contains %q: %s", bad, csp)
		}
	}
	// The visible policy line quotes the policy.
	if !strings.Contains(page, `<code id="csp-line">`+html.EscapeString(csp)+`</code>`) {
		t.Error("the visible CSP line does not match the policy")
	}
	// Self-contained: no remote reference of any kind, no placeholder left.
	for _, bad := range []string{"http://", "https://", "src=\"", "@import", "url(", "{{"} {
		if i := strings.Index(page, bad); i >= 0 {
			t.Errorf("page contains %q near %q", bad, page[max(0, i-40):min(len(page), i+40)])
		}
	}
	// The engine is inlined as base64 of the gzip bytes, and the version is filled in.
	if !strings.Contains(page, base64.StdEncoding.EncodeToString(a.WasmGz)) || !strings.Contains(page, `data-raw-size="16"`) {
		t.Error("engine not inlined")
	}
	if !strings.Contains(page, "const VERSION = '0.1.0'") || !strings.Contains(page, `<span id="version">0.1.0</span>`) {
		t.Error("version not filled in")
	}
	if !strings.Contains(page, "globalThis.Go = class") {
		t.Error("wasm_exec.js not prepended to the worker")
	}
	// Deterministic.
	again, _ := Assemble(a)
	if !bytes.Equal(out, again) {
		t.Error("Assemble is not deterministic")
	}
}

func TestAssembleRejects(t *testing.T) {
	a := fakeAssets(t)
	bad := a
	bad.WasmGz = []byte("plain")
	if _, err := Assemble(bad); err == nil {
		t.Error("non-gzip engine accepted")
	}
	bad = a
	bad.WasmExec = []byte("console.log(1)")
	if _, err := Assemble(bad); err == nil {
		t.Error("foreign wasm_exec.js accepted")
	}
	bad = a
	bad.WasmExec = []byte("globalThis.Go = 1; '</script>'")
	if _, err := Assemble(bad); err == nil || !strings.Contains(err.Error(), "</script") {
		t.Errorf("script end inside the worker accepted: %v", err)
	}
	bad = a
	bad.Version = "1'; alert(1); '"
	if _, err := Assemble(bad); err == nil {
		t.Error("a version that breaks out of the string accepted")
	}
}

func TestCheckScripts(t *testing.T) {
	ok := `<script type="text/plain">x</script><script>APP</script>`
	if err := checkScripts(ok, "APP"); err != nil {
		t.Error(err)
	}
	if err := checkScripts(`<script>APP</script><script>other</script>`, "APP"); err == nil {
		t.Error("a second executable script accepted")
	}
	if err := checkScripts(`<script>changed</script>`, "APP"); err == nil {
		t.Error("an unhashed script accepted")
	}
}

func TestPage(t *testing.T) {
	b, err := Page()
	if _, statErr := os.Stat("dist/" + PageFile); statErr != nil {
		// Not built: the error must say how to build it.
		if !errors.Is(err, ErrNotBuilt) || !strings.Contains(err.Error(), "scripts/build-page.sh") {
			t.Errorf("Page() without a built page: %v", err)
		}
		return
	}
	if err != nil || !bytes.HasPrefix(b, []byte("<!DOCTYPE html>")) || !bytes.Contains(b, []byte("Content-Security-Policy")) {
		t.Errorf("Page(): %d bytes, %v", len(b), err)
	}
}
