package site

import (
	"crypto/sha256"
	"embed"
	"encoding/base64"
	"errors"
	"fmt"
	"html"
	"io/fs"
	"regexp"
	"strconv"
	"strings"
)

//go:embed src/index.html src/style.css src/app.js src/worker.js
var src embed.FS

// dist holds the built page (rootshift.html, git-ignored) and a committed
// placeholder (not-built.html) so that the pattern always matches.
//
//go:embed dist/*.html
var dist embed.FS

// PageFile is the name of the built page inside dist/.
const PageFile = "rootshift.html"

// ErrNotBuilt is returned by Page when the binary was built without the page.
var ErrNotBuilt = errors.New("the offline page is not built into this binary: run scripts/build-page.sh " +
	"(it writes site/dist/rootshift.html), then build rootshift again")

// Page returns the built offline page embedded in the binary, or an error
// wrapping ErrNotBuilt telling how to build it.
func Page() ([]byte, error) {
	b, err := fs.ReadFile(dist, "dist/"+PageFile)
	if err != nil {
		return nil, ErrNotBuilt
	}
	if len(b) == 0 {
		return nil, ErrNotBuilt
	}
	return b, nil
}

// Assets are the inputs of Assemble.
type Assets struct {
	// WasmGz is the engine (GOOS=js GOARCH=wasm build of ./wasm), gzipped.
	WasmGz []byte
	// WasmSize is the size of the engine before gzip, in bytes.
	WasmSize int
	// WasmExec is $(go env GOROOT)/lib/wasm/wasm_exec.js of the Go that built the engine.
	WasmExec []byte
	// Version is the engine version (battery.Version), shown in the page and
	// returned by window.rootshift.version().
	Version string
}

// Hash returns the CSP source expression 'sha256-...' of an inline script or style.
func Hash(content string) string {
	sum := sha256.Sum256([]byte(content))
	return "'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) + "'"
}

// CSP returns the page's Content-Security-Policy for the given hashes.
func CSP(scriptHashes, styleHashes []string) string {
	return "default-src 'none'; script-src " + strings.Join(scriptHashes, " ") + " 'wasm-unsafe-eval'; " +
		"worker-src blob:; style-src " + strings.Join(styleHashes, " ") + "; img-src data: blob:; " +
		"connect-src 'none'; font-src 'none'; object-src 'none'; media-src 'none'; frame-src 'none'; " +
		"manifest-src 'none'; base-uri 'none'; form-action 'none'"
}

var (
	versionRE  = regexp.MustCompile(`^[0-9A-Za-z.+-]+$`)
	scriptOpen = regexp.MustCompile(`(?i)<script\b[^>]*>`)
	// placeholderRE matches the markers of the page template.
	placeholderRE = regexp.MustCompile(`\{\{[A-Z_]+\}\}`)
	known         = map[string]bool{"{{CSP}}": true, "{{CSP_TEXT}}": true, "{{STYLE}}": true, "{{WORKER}}": true,
		"{{WASM_RAW}}": true, "{{WASM}}": true, "{{APP}}": true, "{{VERSION}}": true}
)

// checkRaw reports text that would end or confuse the element it is inlined into.
func checkRaw(what, text string) error {
	l := strings.ToLower(text)
	for _, bad := range []string{"</script", "<!--", "</style"} {
		if strings.Contains(l, bad) {
			return fmt.Errorf("site: %s contains %q and cannot be inlined", what, bad)
		}
	}
	return nil
}

// Assemble builds the self-contained page from the sources in src/ and a.
func Assemble(a Assets) ([]byte, error) {
	if len(a.WasmGz) < 2 || a.WasmGz[0] != 0x1f || a.WasmGz[1] != 0x8b {
		return nil, errors.New("site: WasmGz is not gzip data")
	}
	if len(a.WasmExec) == 0 || !strings.Contains(string(a.WasmExec), "globalThis.Go") {
		return nil, errors.New("site: WasmExec is not the Go distribution's wasm_exec.js")
	}
	if !versionRE.MatchString(a.Version) {
		return nil, fmt.Errorf("site: bad version %q", a.Version)
	}
	read := func(name string) (string, error) {
		b, err := src.ReadFile("src/" + name)
		return string(b), err
	}
	page, err := read("index.html")
	if err != nil {
		return nil, err
	}
	style, err := read("style.css")
	if err != nil {
		return nil, err
	}
	app, err := read("app.js")
	if err != nil {
		return nil, err
	}
	worker, err := read("worker.js")
	if err != nil {
		return nil, err
	}
	app = strings.ReplaceAll(app, "{{VERSION}}", a.Version)
	worker = "// wasm_exec.js from the Go distribution that built the engine.\n" + string(a.WasmExec) + "\n" + worker
	for what, text := range map[string]string{"style.css": style, "app.js": app, "worker": worker} {
		if err := checkRaw(what, text); err != nil {
			return nil, err
		}
	}
	for _, m := range placeholderRE.FindAllString(page, -1) {
		if !known[m] {
			return nil, fmt.Errorf("site: unknown placeholder %s in index.html", m)
		}
	}
	csp := CSP([]string{Hash(app)}, []string{Hash(style)})
	out := strings.NewReplacer(
		"{{CSP}}", csp,
		"{{CSP_TEXT}}", html.EscapeString(csp),
		"{{STYLE}}", style,
		"{{WORKER}}", worker,
		"{{WASM_RAW}}", strconv.Itoa(a.WasmSize),
		"{{WASM}}", base64.StdEncoding.EncodeToString(a.WasmGz),
		"{{APP}}", app,
		"{{VERSION}}", a.Version,
	).Replace(page)
	if err := checkScripts(out, app); err != nil {
		return nil, err
	}
	return []byte(out), nil
}

// checkScripts verifies that the only executable inline script is app, whose
// hash the policy allows; the other scripts are data (type text/plain or
// application/octet-stream), which browsers never execute.
func checkScripts(page, app string) error {
	exec := 0
	for _, loc := range scriptOpen.FindAllStringIndex(page, -1) {
		tag := page[loc[0]:loc[1]]
		if strings.Contains(tag, `type="text/plain"`) || strings.Contains(tag, `type="application/octet-stream"`) {
			continue
		}
		exec++
		end := strings.Index(strings.ToLower(page[loc[1]:]), "</script")
		if end < 0 || page[loc[1]:loc[1]+end] != app {
			return errors.New("site: an executable inline script is not the hashed page script")
		}
	}
	if exec != 1 {
		return fmt.Errorf("site: %d executable inline scripts, want 1", exec)
	}
	return nil
}
