//go:build js && wasm

package main

import (
	"context"
	"encoding/json"
	"fmt"
	"time"

	"github.com/hack-pad/safejs"
	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/wasm/bridge"
)

// handler is one export: it receives the call's arguments and returns a JSON envelope.
type handler func(args []safejs.Value) (string, error)

// guard wraps h so that argument errors and panics become error envelopes.
func guard(h handler) func(this safejs.Value, args []safejs.Value) any {
	return func(_ safejs.Value, args []safejs.Value) (out any) {
		defer func() {
			if p := recover(); p != nil {
				out = bridge.Call(func() (any, error) { panic(p) })
			}
		}()
		s, err := h(args)
		if err != nil {
			return bridge.Call(func() (any, error) { return nil, bridge.ArgError(err) })
		}
		return s
	}
}

func argString(args []safejs.Value, i int) (string, error) {
	if i >= len(args) || args[i].IsUndefined() || args[i].IsNull() {
		return "", nil
	}
	return args[i].String()
}

func argInt(args []safejs.Value, i int) (int, error) {
	if i >= len(args) {
		return 0, fmt.Errorf("argument %d is missing", i+1)
	}
	return args[i].Int()
}

func argBool(args []safejs.Value, i int) (bool, error) {
	if i >= len(args) || args[i].IsUndefined() || args[i].IsNull() {
		return false, nil
	}
	return args[i].Bool()
}

// argBytes copies a Uint8Array argument into Go.
func argBytes(args []safejs.Value, i int) ([]byte, error) {
	if i >= len(args) || args[i].IsUndefined() || args[i].IsNull() {
		return nil, nil
	}
	n, err := args[i].Length()
	if err != nil {
		return nil, err
	}
	b := make([]byte, n)
	if _, err := safejs.CopyBytesToGo(b, args[i]); err != nil {
		return nil, fmt.Errorf("argument %d must be a Uint8Array: %v", i+1, err)
	}
	return b, nil
}

// progressTo returns a progress callback that forwards at most one update
// per 100 ms (and every change of stage or test) as JSON text to fn.
func progressTo(fn safejs.Value) func(battery.Progress) {
	if fn.Type() != safejs.TypeFunction {
		return nil
	}
	var last time.Time
	var lastKey string
	return func(p battery.Progress) {
		key := p.Stage + "\x00" + p.Series + "\x00" + p.Test
		now := time.Now()
		if key == lastKey && now.Sub(last) < 100*time.Millisecond && p.Done != p.Total {
			return
		}
		last, lastKey = now, key
		b, err := json.Marshal(map[string]any{"stage": p.Stage, "series": p.Series, "test": p.Test, "done": p.Done, "total": p.Total})
		if err != nil {
			return
		}
		_, _ = fn.Invoke(string(b)) // progress is best effort
	}
}

// argsInput reads the arguments every analysis call starts with: the
// input's name, its bytes and the settings' JSON text.
func argsInput(args []safejs.Value) (name string, data []byte, settings string, err error) {
	if name, err = argString(args, 0); err != nil {
		return
	}
	if data, err = argBytes(args, 1); err != nil {
		return
	}
	settings, err = argString(args, 2)
	return
}

func main() {
	session := bridge.NewSession()
	exports := map[string]handler{
		"analyze": func(args []safejs.Value) (string, error) {
			name, err := argString(args, 0)
			if err != nil {
				return "", err
			}
			data, err := argBytes(args, 1)
			if err != nil {
				return "", err
			}
			settings, err := argString(args, 2)
			if err != nil {
				return "", err
			}
			var progress func(battery.Progress)
			if len(args) > 3 {
				progress = progressTo(args[3])
			}
			return session.Analyze(context.Background(), name, data, settings, progress), nil
		},
		"plan": func(args []safejs.Value) (string, error) {
			name, data, settings, err := argsInput(args)
			if err != nil {
				return "", err
			}
			pilot, err := argBool(args, 3)
			if err != nil {
				return "", err
			}
			return bridge.PlanAnalysis(context.Background(), name, data, settings, pilot), nil
		},
		"part": func(args []safejs.Value) (string, error) {
			name, data, settings, err := argsInput(args)
			if err != nil {
				return "", err
			}
			list, err := argString(args, 3)
			if err != nil {
				return "", err
			}
			var indices []int
			if err := json.Unmarshal([]byte(list), &indices); err != nil {
				return "", fmt.Errorf("argument 4 must be a JSON array of series indices: %v", err)
			}
			var progress func(battery.Progress)
			if len(args) > 4 {
				progress = progressTo(args[4])
			}
			return bridge.AnalyzePart(context.Background(), name, data, settings, indices, progress), nil
		},
		"assemble": func(args []safejs.Value) (string, error) {
			name, data, settings, err := argsInput(args)
			if err != nil {
				return "", err
			}
			parts, err := argString(args, 3)
			if err != nil {
				return "", err
			}
			partial, err := argBool(args, 4)
			if err != nil {
				return "", err
			}
			return session.Assemble(name, data, settings, parts, partial), nil
		},
		"inspect": func(args []safejs.Value) (string, error) {
			name, err := argString(args, 0)
			if err != nil {
				return "", err
			}
			data, err := argBytes(args, 1)
			if err != nil {
				return "", err
			}
			settings, err := argString(args, 2)
			if err != nil {
				return "", err
			}
			return bridge.Inspect(name, data, settings), nil
		},
		"export": func(args []safejs.Value) (string, error) {
			f, err := argString(args, 0)
			if err != nil {
				return "", err
			}
			return session.Export(f), nil
		},
		"plots": func(args []safejs.Value) (string, error) {
			i, err := argInt(args, 0)
			if err != nil {
				return "", err
			}
			return session.Plots(i), nil
		},
		"bench": func(args []safejs.Value) (string, error) {
			n, err := argInt(args, 0)
			if err != nil {
				return "", err
			}
			return bridge.Bench(n), nil
		},
		"about": func([]safejs.Value) (string, error) { return bridge.AboutInfo(), nil },
		"demo":  func([]safejs.Value) (string, error) { return bridge.Demo(), nil },
	}
	global := safejs.Global()
	obj, err := global.Get("Object")
	if err != nil {
		panic(err)
	}
	engine, err := obj.New()
	if err != nil {
		panic(err)
	}
	for name, h := range exports {
		fn, err := safejs.FuncOf(guard(h))
		if err != nil {
			panic(err)
		}
		if err := engine.Set(name, fn.Value()); err != nil {
			panic(err)
		}
	}
	if err := engine.Set("version", battery.Version); err != nil {
		panic(err)
	}
	if err := global.Set("rootshiftEngine", engine); err != nil {
		panic(err)
	}
	if ready, err := global.Get("rootshiftReady"); err == nil && ready.Type() == safejs.TypeFunction {
		_, _ = ready.Invoke()
	}
	select {}
}
