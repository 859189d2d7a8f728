//go:build js && wasm

// Tests of the JavaScript glue, run under Node.js by scripts/wasm-test.sh
// (GOOS=js GOARCH=wasm go test -exec go_js_wasm_exec ./wasm/). Common
// practice, no source: panics and bad arguments must come back as error
// envelopes, never end the Go program.
package main

import (
	"encoding/json"
	"strings"
	"testing"

	"github.com/hack-pad/safejs"
	"github.com/rootshift/rootshift/wasm/bridge"
)

func envelope(t *testing.T, v any) bridge.Reply {
	t.Helper()
	s, ok := v.(string)
	if !ok {
		t.Fatalf("export returned %T, want a JSON string", v)
	}
	var r bridge.Reply
	if err := json.Unmarshal([]byte(s), &r); err != nil {
		t.Fatalf("not an envelope: %v: %s", err, s)
	}
	return r
}

func jsValue(t *testing.T, x any) safejs.Value {
	t.Helper()
	v, err := safejs.ValueOf(x)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func TestGuardRecoversPanics(t *testing.T) {
	h := guard(func([]safejs.Value) (string, error) { panic("boom") })
	r := envelope(t, h(safejs.Undefined(), nil))
	if r.OK || r.Error.Kind != bridge.KindInternal || !strings.Contains(r.Error.Message, "boom") {
		t.Errorf("panic: %+v", r.Error)
	}
	h = guard(func(args []safejs.Value) (string, error) {
		_ = args[5] // index out of range
		return "", nil
	})
	if r := envelope(t, h(safejs.Undefined(), nil)); r.OK || r.Error.Kind != bridge.KindInternal {
		t.Errorf("runtime error: %+v", r)
	}
}

func TestArguments(t *testing.T) {
	// A number where an int is expected works; a string does not.
	args := []safejs.Value{jsValue(t, 3), jsValue(t, "x")}
	if n, err := argInt(args, 0); err != nil || n != 3 {
		t.Errorf("argInt = %d, %v", n, err)
	}
	if _, err := argInt(args, 1); err == nil {
		t.Error("argInt accepted a string")
	}
	if _, err := argInt(args, 2); err == nil {
		t.Error("argInt accepted a missing argument")
	}
	// Missing strings and bytes are empty, not errors.
	if s, err := argString(args, 4); err != nil || s != "" {
		t.Errorf("missing string: %q %v", s, err)
	}
	// Uint8Array arguments are copied into Go.
	u8, err := safejs.Global().Get("Uint8Array")
	if err != nil {
		t.Fatal(err)
	}
	arr, err := u8.New(3)
	if err != nil {
		t.Fatal(err)
	}
	for i, b := range []byte{'a', ',', 'b'} {
		if err := arr.SetIndex(i, int(b)); err != nil {
			t.Fatal(err)
		}
	}
	b, err := argBytes([]safejs.Value{arr}, 0)
	if err != nil || string(b) != "a,b" {
		t.Errorf("argBytes = %q, %v", b, err)
	}
	if _, err := argBytes([]safejs.Value{jsValue(t, "text")}, 0); err == nil {
		t.Error("argBytes accepted a string")
	}
	// A bad argument reaches JavaScript as a usage error envelope.
	h := guard(func(args []safejs.Value) (string, error) {
		_, err := argInt(args, 0)
		return "", err
	})
	if r := envelope(t, h(safejs.Undefined(), []safejs.Value{jsValue(t, "x")})); r.OK || r.Error.Kind != bridge.KindUsage {
		t.Errorf("bad argument: %+v", r)
	}
	// progressTo ignores a value that is not a function.
	if progressTo(jsValue(t, 1)) != nil {
		t.Error("progressTo accepted a number")
	}
}
