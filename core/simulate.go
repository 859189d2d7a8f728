package core

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"github.com/rootshift/rootshift/core/schema"
)

// SimSpec configures a Monte Carlo run.
type SimSpec struct {
	// Reps is the number of replications.
	Reps int
	// Seed: replication r draws from rand.NewPCG(Seed, r), so results are
	// identical bit for bit whatever the number of workers.
	Seed uint64
	// Workers is the number of goroutines; 0: runtime.GOMAXPROCS(0).
	Workers int
	// Progress, if set, is called (from any goroutine, serialised) with the
	// number of replications done.
	Progress func(done, total int)
}

// Distribution is a simulated null distribution of a statistic.
type Distribution struct {
	// Sorted holds the finite draws in increasing order.
	Sorted []float64
	// Failed counts replications whose statistic could not be computed.
	Failed int
	Reps   int
	Seed   uint64
}

// Simulate runs spec.Reps replications of stat, each on its own random
// stream, in parallel. newRep is called once per worker and returns that
// worker's replication function. It returns ErrCancelled (wrapped) when ctx
// is cancelled.
func Simulate(ctx context.Context, spec SimSpec, newRep func() func(r *rand.Rand) (float64, error)) (*Distribution, error) {
	if spec.Reps <= 0 {
		return nil, fmt.Errorf("%w: simulation needs at least one replication", ErrSettings)
	}
	workers := spec.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	if workers > spec.Reps {
		workers = spec.Reps
	}
	out := make([]float64, spec.Reps)
	var next, done atomic.Int64
	var progMu sync.Mutex
	const chunk = 64
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			rep := newRep()
			pcg := rand.NewPCG(0, 0)
			r := rand.New(pcg)
			for {
				if ctx.Err() != nil {
					return
				}
				lo := int(next.Add(chunk)) - chunk
				if lo >= spec.Reps {
					return
				}
				hi := min(lo+chunk, spec.Reps)
				for i := lo; i < hi; i++ {
					pcg.Seed(spec.Seed, uint64(i))
					v, err := rep(r)
					if err != nil {
						v = math.NaN()
					}
					out[i] = v
				}
				d := done.Add(int64(hi - lo))
				if spec.Progress != nil {
					progMu.Lock()
					spec.Progress(int(d), spec.Reps)
					progMu.Unlock()
				}
			}
		}()
	}
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return nil, fmt.Errorf("%w: %v", ErrCancelled, err)
	}
	d := &Distribution{Reps: spec.Reps, Seed: spec.Seed}
	d.Sorted = out[:0]
	for _, v := range out {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			d.Failed++
			continue
		}
		d.Sorted = append(d.Sorted, v)
	}
	slices.Sort(d.Sorted)
	if len(d.Sorted) == 0 {
		return nil, fmt.Errorf("%w: every replication failed", ErrNoEstimate)
	}
	return d, nil
}

// SimulateTest simulates the null distribution of a registered test at
// length T under cfg. The null DGP is info.GenerateFor(T, cfg) when set,
// else info.Generate (default RandomWalk).
func SimulateTest(ctx context.Context, info Info, T int, cfg *Config, spec SimSpec) (*Distribution, error) {
	gen := info.Generate
	if info.GenerateFor != nil {
		gen = info.GenerateFor(T, cfg)
	}
	if gen == nil {
		gen = RandomWalk
	}
	return Simulate(ctx, spec, func() func(r *rand.Rand) (float64, error) {
		stat := info.StatOf(T, cfg)
		y := make([]float64, T)
		return func(r *rand.Rand) (float64, error) {
			gen(y, r)
			return stat(y)
		}
	})
}

// Quantile returns the p-quantile of the distribution (type 7 interpolation).
func (d *Distribution) Quantile(p float64) float64 {
	s := d.Sorted
	n := len(s)
	if n == 1 {
		return s[0]
	}
	h := p * float64(n-1)
	i := int(math.Floor(h))
	if i >= n-1 {
		return s[n-1]
	}
	if i < 0 {
		return s[0]
	}
	return s[i] + (h-float64(i))*(s[i+1]-s[i])
}

// QuantileSE is the Monte Carlo standard error of Quantile(p): the
// asymptotic sqrt(p(1-p)/n)/f(q) with the density f estimated from the
// spacing of order statistics around q (a difference quotient over
// ±sqrt(p(1-p)/n)·1.96 in probability, at least ±1/n).
func (d *Distribution) QuantileSE(p float64) float64 {
	n := float64(len(d.Sorted))
	sd := math.Sqrt(p * (1 - p) / n)
	h := math.Max(1.96*sd, 2/n)
	lo, hi := math.Max(p-h, 0), math.Min(p+h, 1)
	dq := d.Quantile(hi) - d.Quantile(lo)
	if dq <= 0 || hi <= lo {
		return 0
	}
	return sd * dq / (hi - lo)
}

// PValue returns the simulated p-value of stat: the share of draws at or
// below it for a left-tailed test, at or above it for a right-tailed one,
// with the (count+1)/(n+1) correction so it is never exactly zero.
func (d *Distribution) PValue(stat float64, tail string) float64 {
	n := len(d.Sorted)
	var c int
	if tail == "right" {
		i, _ := slices.BinarySearch(d.Sorted, stat) // first >= stat
		c = n - i
	} else {
		i := sortUpper(d.Sorted, stat) // first > stat
		c = i
	}
	return float64(c+1) / float64(n+1)
}

func sortUpper(s []float64, x float64) int {
	lo, hi := 0, len(s)
	for lo < hi {
		m := (lo + hi) / 2
		if s[m] <= x {
			lo = m + 1
		} else {
			hi = m
		}
	}
	return lo
}

// Critical returns the critical values at levels 1%, 5%, 10% (and 2.5%) for
// the given tail, keyed as in the schema.
func (d *Distribution) Critical(tail string) map[string]float64 {
	out := map[string]float64{}
	for _, p := range []float64{0.01, 0.025, 0.05, 0.10} {
		q := p
		if tail == "right" {
			q = 1 - p
		}
		out[schema.LevelKey(p)] = d.Quantile(q)
	}
	return out
}

// AddSimulated runs cfg.Sims replications of the test's null distribution at
// the length of y and fills res.PValueSim, res.CriticalValuesSim and
// res.SimMethod. It is what `--sims N` does for every test.
func AddSimulated(ctx context.Context, info Info, T int, cfg *Config, res *schema.Result) error {
	if cfg.Sims <= 0 || res.Statistic == nil {
		return nil
	}
	d, err := SimulateTest(ctx, info, T, cfg, SimSpec{Reps: cfg.Sims, Seed: cfg.Seed, Workers: cfg.Workers, Progress: cfg.Progress})
	if err != nil {
		return err
	}
	ApplySimulated(info, d, T, res)
	return nil
}

// ApplyDistribution fills the simulated fields of res from d, a simulation
// under the default null (Gaussian random walk).
func ApplyDistribution(d *Distribution, T int, res *schema.Result) {
	applyDistribution(d, T, res, "Gaussian random walk")
}

// ApplySimulated is ApplyDistribution for a distribution simulated under
// info's null: the method text names info.NullDGP when the test declares one.
func ApplySimulated(info Info, d *Distribution, T int, res *schema.Result) {
	dgp := "Gaussian random walk"
	if info.NullDGP != "" {
		dgp = info.NullDGP
	}
	applyDistribution(d, T, res, dgp)
}

func applyDistribution(d *Distribution, T int, res *schema.Result, dgp string) {
	p := d.PValue(*res.Statistic, res.Tail)
	res.PValueSim = &p
	res.CriticalValuesSim = d.Critical(res.Tail)
	res.SimMethod = fmt.Sprintf("Monte Carlo under the null (%s, T=%d, same settings), %d replications, seed %d", dgp, T, d.Reps, d.Seed)
	if d.Failed > 0 {
		res.SimMethod += fmt.Sprintf(", %d failed replications dropped", d.Failed)
	}
}

// SimulateRows runs spec.Reps replications that each return a row of
// numbers (several statistics of one simulated sample), in parallel, with
// the same seeding rule as Simulate: replication r draws from
// rand.NewPCG(spec.Seed, r), so the rows are identical whatever the number
// of workers. newRep is called once per worker. Rows are returned in
// replication order; a replication's row is kept as returned (it may hold
// NaN or ±Inf). It returns ErrCancelled (wrapped) when ctx is cancelled.
func SimulateRows(ctx context.Context, spec SimSpec, newRep func() func(r *rand.Rand) []float64) ([][]float64, error) {
	if spec.Reps <= 0 {
		return nil, fmt.Errorf("%w: simulation needs at least one replication", ErrSettings)
	}
	workers := spec.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = min(workers, spec.Reps)
	out := make([][]float64, spec.Reps)
	var next, done atomic.Int64
	var progMu sync.Mutex
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			rep := newRep()
			pcg := rand.NewPCG(0, 0)
			r := rand.New(pcg)
			for ctx.Err() == nil {
				i := int(next.Add(1)) - 1
				if i >= spec.Reps {
					return
				}
				pcg.Seed(spec.Seed, uint64(i))
				out[i] = rep(r)
				if d := done.Add(1); spec.Progress != nil {
					progMu.Lock()
					spec.Progress(int(d), spec.Reps)
					progMu.Unlock()
				}
			}
		}()
	}
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return nil, fmt.Errorf("%w: %v", ErrCancelled, err)
	}
	return out, nil
}
