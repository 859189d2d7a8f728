package battery

import (
	"context"
	"fmt"
	"io"
	"math/rand/v2"
	"runtime"
	"sort"
	"strings"
	"sync"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// Family is a simulated data-generating process with the verdict classes
// that count as right for it.
type Family struct {
	Name string
	// Describe says what the process is.
	Describe string
	// Want is the class the process was built to have; Accept lists classes
	// that lead to the same treatment of the series (may be empty).
	Want   string
	Accept []string
	// Gen fills y (length T) from r.
	Gen func(y []float64, r *rand.Rand)
}

// Families are the processes of the verdict study (innovations N(0,1),
// breaks at the middle of the sample). The processes are the trade's
// textbook cases; their parameters are ours (common practice, no source).
var Families = []Family{
	{"random walk", "y_t = y_{t-1} + e_t", ClassUnitRoot, []string{ClassUnitRootBreaks}, func(y []float64, r *rand.Rand) {
		s := 0.0
		for i := range y {
			s += r.NormFloat64()
			y[i] = s
		}
	}},
	{"random walk with drift", "y_t = 0.3 + y_{t-1} + e_t", ClassUnitRoot, []string{ClassUnitRootBreaks}, func(y []float64, r *rand.Rand) {
		s := 0.0
		for i := range y {
			s += 0.3 + r.NormFloat64()
			y[i] = s
		}
	}},
	{"trend-stationary", "y_t = 0.05 t + u_t, u_t = 0.5 u_{t-1} + e_t", ClassTrendStationary, nil, func(y []float64, r *rand.Rand) {
		u := 0.0
		for i := range y {
			u = 0.5*u + r.NormFloat64()
			y[i] = 0.05*float64(i+1) + u
		}
	}},
	{"stationary with a level shift", "y_t = 4·1(t > T/2) + u_t, u_t = 0.5 u_{t-1} + e_t", ClassBreakStationary, nil, func(y []float64, r *rand.Rand) {
		u := 0.0
		for i := range y {
			u = 0.5*u + r.NormFloat64()
			y[i] = u
			if i >= len(y)/2 {
				y[i] += 4
			}
		}
	}},
	{"stationary with a trend break", "y_t = 0.05 t + 0.1 (t - T/2) 1(t > T/2) + u_t, u_t = 0.5 u_{t-1} + e_t", ClassBreakStationary, []string{ClassTrendStationary}, func(y []float64, r *rand.Rand) {
		u := 0.0
		h := len(y) / 2
		for i := range y {
			u = 0.5*u + r.NormFloat64()
			t := float64(i + 1)
			y[i] = 0.05*t + u
			if i >= h {
				y[i] += 0.1 * (t - float64(h))
			}
		}
	}},
	{"random walk with a drift break", "y_t = y_{t-1} + 0.5 - 1(t > T/2) + e_t", ClassUnitRootBreaks, []string{ClassUnitRoot}, func(y []float64, r *rand.Rand) {
		s := 0.0
		for i := range y {
			d := 0.5
			if i >= len(y)/2 {
				d = -0.5
			}
			s += d + r.NormFloat64()
			y[i] = s
		}
	}},
	{"random walk with a level shift", "y_t = y_{t-1} + e_t + 8·1(t = T/2+1)", ClassUnitRoot, []string{ClassUnitRootBreaks}, func(y []float64, r *rand.Rand) {
		s := 0.0
		for i := range y {
			s += r.NormFloat64()
			if i == len(y)/2 {
				s += 8
			}
			y[i] = s
		}
	}},
	{"explosive AR(1)", "y_t = 1.02 y_{t-1} + e_t, y_0 = 0", ClassExplosive, nil, func(y []float64, r *rand.Rand) {
		s := 0.0
		for i := range y {
			s = 1.02*s + r.NormFloat64()
			y[i] = s
		}
	}},
}

// StudyRow is one family's outcome.
type StudyRow struct {
	Family  Family
	Draws   int
	Counts  map[string]int
	Failed  int
	Correct float64 // share in Want
	Usable  float64 // share in Want or Accept
}

// Classes lists the verdict classes in report order.
var Classes = []string{ClassStationary, ClassTrendStationary, ClassBreakStationary, ClassUnitRoot, ClassUnitRootBreaks, ClassExplosive, ClassInconclusive}

// Study runs the default battery and the verdict on draws simulated series of
// length T from every family (draw i of family f uses rand.NewPCG(seed,
// f<<32|i)), in parallel, and counts the classes.
func Study(ctx context.Context, draws, T int, seed uint64, s schema.Settings, progress func(done, total int)) ([]StudyRow, error) {
	rows := make([]StudyRow, len(Families))
	type job struct{ f, i int }
	jobs := make(chan job)
	var mu sync.Mutex
	done, total := 0, draws*len(Families)
	for f := range Families {
		rows[f] = StudyRow{Family: Families[f], Draws: draws, Counts: map[string]int{}}
	}
	var wg sync.WaitGroup
	for w := 0; w < runtime.GOMAXPROCS(0); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			y := make([]float64, T)
			for j := range jobs {
				r := rand.New(rand.NewPCG(seed, uint64(j.f)<<32|uint64(j.i)))
				Families[j.f].Gen(y, r)
				in := dataset.Series{Name: "sim", Values: append([]float64(nil), y...)}
				sr, err := AnalyzeSeries(ctx, in, s, &Options{Workers: 1})
				mu.Lock()
				if err != nil || sr.Verdict == nil {
					rows[j.f].Failed++
				} else {
					rows[j.f].Counts[sr.Verdict.Class]++
				}
				done++
				if progress != nil {
					progress(done, total)
				}
				mu.Unlock()
			}
		}()
	}
	for i := 0; i < draws && ctx.Err() == nil; i++ {
		for f := range Families {
			jobs <- job{f, i}
		}
	}
	close(jobs)
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	for f := range rows {
		row := &rows[f]
		row.Correct = float64(row.Counts[row.Family.Want]) / float64(draws)
		u := row.Counts[row.Family.Want]
		for _, c := range row.Family.Accept {
			u += row.Counts[c]
		}
		row.Usable = float64(u) / float64(draws)
	}
	return rows, nil
}

// WriteStudy writes the confusion table as Markdown.
func WriteStudy(w io.Writer, rows []StudyRow, T int, seed uint64) {
	fmt.Fprintf(w, "| simulated process (T=%d, %d draws each) | built as |", T, rows[0].Draws)
	for _, c := range Classes {
		fmt.Fprintf(w, " %s |", c)
	}
	fmt.Fprintf(w, " right | usable |\n|---|---|")
	for range Classes {
		fmt.Fprint(w, "---:|")
	}
	fmt.Fprint(w, "---:|---:|\n")
	for _, r := range rows {
		fmt.Fprintf(w, "| %s: %s | %s |", r.Family.Name, r.Family.Describe, r.Family.Want)
		for _, c := range Classes {
			fmt.Fprintf(w, " %d |", r.Counts[c])
		}
		fmt.Fprintf(w, " %.0f%% | %.0f%% |\n", 100*r.Correct, 100*r.Usable)
	}
	var acc []string
	for _, r := range rows {
		if len(r.Family.Accept) > 0 {
			acc = append(acc, fmt.Sprintf("%s: %s", r.Family.Name, strings.Join(r.Family.Accept, ", ")))
		}
	}
	sort.Strings(acc)
	fmt.Fprintf(w, "\n\"right\" counts the class each process was built to have; \"usable\" also counts classes that lead to the same treatment (%s). Seed %d; default settings; 5%% level.\n", strings.Join(acc, "; "), seed)
}
