package batch

import (
	"context"
	"runtime"
	"sort"
	"sync"
)

// Pool runs work on every item that produce emits, with jobs workers (0:
// all cores), and hands the results to sink one at a time: in emission
// order, or as they complete when completed is true. At most 4*jobs items
// are in flight (emitted but not yet handed to sink), so memory does not
// grow with the input; emit blocks meanwhile and returns false once the
// pool is cancelled. The result of an item never depends on the number of
// workers, so the output of an ordered pool equals a one-worker run byte for
// byte when work is deterministic.
//
// A work or sink error cancels the pool; results completed before it are
// still handed to sink in order. Pool returns the first sink error, else
// the first work error, else produce's error; cancellation of ctx itself is
// left to the caller to report (ctx.Err()).
func Pool[T, R any](ctx context.Context, jobs int, completed bool,
	produce func(ctx context.Context, emit func(T) bool) error,
	work func(ctx context.Context, item T) (R, error),
	sink func(R) error) error {
	if jobs <= 0 {
		jobs = runtime.GOMAXPROCS(0)
	}
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	inflight := make(chan struct{}, 4*jobs)
	type item struct {
		seq int
		v   T
	}
	type done struct {
		seq int
		r   R
	}
	items := make(chan item)
	results := make(chan done, jobs)
	var prodErr error
	go func() {
		defer close(items)
		seq := 0
		prodErr = produce(ctx, func(v T) bool {
			select {
			case inflight <- struct{}{}:
			case <-ctx.Done():
				return false
			}
			select {
			case items <- item{seq, v}:
				seq++
				return true
			case <-ctx.Done():
				<-inflight
				return false
			}
		})
	}()
	var wg sync.WaitGroup
	var workErr error
	var workOnce sync.Once
	for w := 0; w < jobs; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for it := range items {
				r, err := work(ctx, it.v)
				if err != nil {
					workOnce.Do(func() { workErr = err })
					cancel()
					<-inflight
					// The slot of a lost item: later items are written
					// only after cancellation, in order (below).
					results <- done{seq: -1 - it.seq}
					continue
				}
				results <- done{it.seq, r}
			}
		}()
	}
	go func() { wg.Wait(); close(results) }()

	pending := map[int]R{}
	lost := map[int]bool{}
	next := 0
	var sinkErr error
	write := func(r R) {
		if sinkErr != nil {
			return
		}
		if err := sink(r); err != nil {
			sinkErr = err
			cancel()
		}
	}
	for d := range results {
		if d.seq < 0 {
			lost[-1-d.seq] = true
		} else if completed {
			<-inflight
			write(d.r)
			continue
		} else {
			pending[d.seq] = d.r
		}
		for {
			if lost[next] {
				delete(lost, next)
				next++
				continue
			}
			r, ok := pending[next]
			if !ok {
				break
			}
			delete(pending, next)
			next++
			<-inflight
			write(r)
		}
	}
	// Anything left (only after cancellation) in sequence order.
	keys := make([]int, 0, len(pending))
	for k := range pending {
		keys = append(keys, k)
	}
	sort.Ints(keys)
	for _, k := range keys {
		write(pending[k])
	}
	switch {
	case sinkErr != nil:
		return sinkErr
	case workErr != nil:
		return workErr
	}
	return prodErr
}
