package battery

import (
	"compress/gzip"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"sort"
	"sync"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

// DistCache keeps one simulated null distribution per distinct (test,
// length, settings), so that a batch of series of equal length simulates
// each distribution once instead of once per series. It is safe for
// concurrent use; concurrent requests for the same key simulate once.
type DistCache struct {
	mu      sync.Mutex
	entries map[string]*cacheEntry
}

type cacheEntry struct {
	once sync.Once
	dist *core.Distribution
	err  error
}

// NewDistCache returns an empty cache.
func NewDistCache() *DistCache { return &DistCache{entries: map[string]*cacheEntry{}} }

// cacheKey holds every setting that changes a test's null distribution.
type cacheKey struct {
	Test          string  `json:"test"`
	T             int     `json:"n"`
	Trend         string  `json:"trend"`
	LagRule       string  `json:"lag_rule"`
	Lags          int     `json:"lags"`
	MaxLags       int     `json:"max_lags"`
	Kernel        string  `json:"kernel"`
	BandwidthRule string  `json:"bandwidth_rule"`
	Bandwidth     float64 `json:"bandwidth"`
	Shift         string  `json:"shift"`
	Trim          float64 `json:"trim"`
	BreakIndex    int     `json:"break_index"`
	RightTail     bool    `json:"right_tail"`
	MinWindow     float64 `json:"min_window"`
	MaxBreaks     int     `json:"max_breaks"`
	Sims          int     `json:"sims"`
	Seed          uint64  `json:"seed"`
	// Period and NoSeasonalDummies change the seasonal test's null.
	Period            int  `json:"period"`
	NoSeasonalDummies bool `json:"no_seasonal_dummies"`
	// Outlier and Shifts choose the meanshift test's model.
	Outlier string `json:"outlier"`
	Shifts  int    `json:"shifts"`
}

func keyOf(id string, T int, c *core.Config) string {
	k := cacheKey{id, T, c.Trend.String(), c.LagRule.String(), c.Lags, c.MaxLags, c.Kernel.String(),
		c.BandwidthRule.String(), c.Bandwidth, c.Shift.String(), c.TrimOr(), c.BreakIndex, c.RightTail,
		c.MinWindow, c.MaxBreaks, c.Sims, c.Seed, c.Period, c.NoSeasonalDummies, c.Outlier.String(), c.ShiftsOr()}
	b, _ := json.Marshal(k)
	return string(b)
}

// Get returns the simulated distribution for the test at length T under
// cfg (cfg.Sims replications, cfg.Seed), simulating it on first use.
func (c *DistCache) Get(ctx context.Context, info core.Info, T int, cfg *core.Config) (*core.Distribution, error) {
	key := keyOf(info.ID, T, cfg)
	c.mu.Lock()
	e, ok := c.entries[key]
	if !ok {
		e = &cacheEntry{}
		c.entries[key] = e
	}
	c.mu.Unlock()
	e.once.Do(func() {
		e.dist, e.err = core.SimulateTest(ctx, info, T, cfg, core.SimSpec{Reps: cfg.Sims, Seed: cfg.Seed, Workers: cfg.Workers})
	})
	if e.err != nil && ctx.Err() != nil {
		// Do not keep a cancelled simulation.
		c.mu.Lock()
		delete(c.entries, key)
		c.mu.Unlock()
	}
	return e.dist, e.err
}

// Apply fills the simulated fields of res from the cached distribution.
func (c *DistCache) Apply(ctx context.Context, info core.Info, T int, cfg *core.Config, res *schema.Result) error {
	d, err := c.Get(ctx, info, T, cfg)
	if err != nil {
		return err
	}
	core.ApplySimulated(info, d, T, res)
	return nil
}

// Len is the number of distributions held.
func (c *DistCache) Len() int {
	c.mu.Lock()
	defer c.mu.Unlock()
	return len(c.entries)
}

type cacheFile struct {
	Format  string      `json:"format"`
	Entries []cacheItem `json:"entries"`
}

type cacheItem struct {
	Key    string    `json:"key"`
	Reps   int       `json:"reps"`
	Seed   uint64    `json:"seed"`
	Failed int       `json:"failed"`
	Sorted []float64 `json:"sorted"`
}

const cacheFormat = "rootshift.distcache/v1"

// Save writes the cache as gzip-compressed JSON.
func (c *DistCache) Save(w io.Writer) error {
	c.mu.Lock()
	var f cacheFile
	f.Format = cacheFormat
	for k, e := range c.entries {
		if e.dist != nil && e.err == nil {
			f.Entries = append(f.Entries, cacheItem{k, e.dist.Reps, e.dist.Seed, e.dist.Failed, e.dist.Sorted})
		}
	}
	c.mu.Unlock()
	sort.Slice(f.Entries, func(i, j int) bool { return f.Entries[i].Key < f.Entries[j].Key })
	zw := gzip.NewWriter(w)
	if err := json.NewEncoder(zw).Encode(&f); err != nil {
		return err
	}
	return zw.Close()
}

// Load adds the entries of a file written by Save.
func (c *DistCache) Load(r io.Reader) error {
	zr, err := gzip.NewReader(r)
	if err != nil {
		return fmt.Errorf("distribution cache: %w", err)
	}
	var f cacheFile
	if err := json.NewDecoder(zr).Decode(&f); err != nil {
		return fmt.Errorf("distribution cache: %w", err)
	}
	if f.Format != cacheFormat {
		return fmt.Errorf("distribution cache: format %q, want %q", f.Format, cacheFormat)
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	for _, it := range f.Entries {
		if len(it.Sorted) == 0 || !sort.Float64sAreSorted(it.Sorted) {
			return fmt.Errorf("distribution cache: entry %s is not a sorted sample", it.Key)
		}
		e := &cacheEntry{dist: &core.Distribution{Sorted: it.Sorted, Reps: it.Reps, Seed: it.Seed, Failed: it.Failed}}
		e.once.Do(func() {})
		c.entries[it.Key] = e
	}
	return nil
}

// LoadFile loads path if it exists (a missing file is not an error).
func (c *DistCache) LoadFile(path string) error {
	f, err := os.Open(path)
	if os.IsNotExist(err) {
		return nil
	}
	if err != nil {
		return err
	}
	defer f.Close()
	return c.Load(f)
}

// SaveFile writes the cache to path atomically.
func (c *DistCache) SaveFile(path string) error {
	tmp := path + ".tmp"
	f, err := os.Create(tmp)
	if err != nil {
		return err
	}
	if err := c.Save(f); err != nil {
		f.Close()
		return err
	}
	if err := f.Close(); err != nil {
		return err
	}
	return os.Rename(tmp, path)
}
