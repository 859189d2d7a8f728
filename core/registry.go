package core

import (
	"context"
	"fmt"
	"math/rand/v2"
	"sort"
	"sync"

	"github.com/rootshift/rootshift/core/schema"
)

// RunFunc runs a test on y with cfg and returns its result.
type RunFunc func(ctx context.Context, y []float64, cfg *Config) (*schema.Result, error)

// StatFunc computes only the statistic of a test on y; it is the hot path of
// the simulation engine. A StatFunc is used by one goroutine and may keep
// scratch space between calls.
type StatFunc func(y []float64) (float64, error)

// Info describes a registered test.
type Info struct {
	// ID is the test id used on the command line and in the schema.
	ID string
	// Name is the test's name in words.
	Name string
	// Null is H0 in words.
	Null string
	// Tail is "left" or "right": which statistics reject.
	Tail string
	// Citation names the paper(s) and equations the test implements.
	Citation string
	// Run is the full test.
	Run RunFunc
	// NewStat returns a statistic-only function for series of length T under
	// cfg, used by the simulation engine. Nil: the engine calls Run.
	NewStat func(T int, cfg *Config) StatFunc
	// Null DGP for simulation; nil: a driftless Gaussian random walk
	// y_t = y_{t-1} + e_t, y_0 = 0, e_t ~ N(0,1).
	Generate func(dst []float64, r *rand.Rand)
	// GenerateFor, when set, is used instead of Generate: the null DGP for
	// series of length T under cfg (the seasonal test's null depends on
	// cfg.Period). NullDGP describes it in words for simulation notes.
	GenerateFor func(T int, cfg *Config) func(dst []float64, r *rand.Rand)
	NullDGP     string
}

var (
	regMu    sync.RWMutex
	registry = map[string]Info{}
)

// Register adds a test. It panics on a duplicate id (a programming error).
func Register(info Info) {
	regMu.Lock()
	defer regMu.Unlock()
	if _, dup := registry[info.ID]; dup {
		panic("core: duplicate test id " + info.ID)
	}
	registry[info.ID] = info
}

// Lookup returns the registered test with that id.
func Lookup(id string) (Info, error) {
	regMu.RLock()
	defer regMu.RUnlock()
	info, ok := registry[id]
	if !ok {
		return Info{}, fmt.Errorf("%w: %q", ErrUnknown, id)
	}
	return info, nil
}

// IDs returns the registered ids, sorted.
func IDs() []string {
	regMu.RLock()
	defer regMu.RUnlock()
	ids := make([]string, 0, len(registry))
	for id := range registry {
		ids = append(ids, id)
	}
	sort.Strings(ids)
	return ids
}

// StatOf returns info.NewStat(T, cfg), or a wrapper around info.Run when the
// test has no dedicated statistic function.
func (info Info) StatOf(T int, cfg *Config) StatFunc {
	if info.NewStat != nil {
		return info.NewStat(T, cfg)
	}
	c := *cfg
	c.NoPath, c.Sims, c.Progress = true, 0, nil
	c.Dates = nil
	return func(y []float64) (float64, error) {
		r, err := info.Run(context.Background(), y, &c)
		if err != nil {
			return 0, err
		}
		if r.Statistic == nil {
			return 0, ErrNoEstimate
		}
		return *r.Statistic, nil
	}
}

// RandomWalk fills dst with a driftless Gaussian random walk starting at 0:
// y_1 = e_1, y_t = y_{t-1} + e_t.
func RandomWalk(dst []float64, r *rand.Rand) {
	s := 0.0
	for i := range dst {
		s += r.NormFloat64()
		dst[i] = s
	}
}
