package report

import (
	"strconv"
)

// Calendar ticks for dated plots. The dates are the labels core/dataset
// writes: "2006" (annual), "2006Q2" (quarterly), "2006-04" (monthly) and
// "2006-04-15" (daily or weekly).

// calDate is a parsed date label: year, month (the first month of a
// quarter; 1 for a year) and whether the label was quarterly.
type calDate struct {
	y, m, d   int // d is 1 unless the label gives the day
	quarterly bool
}

// parseCal reads a date label; ok is false for anything else.
func parseCal(s string) (calDate, bool) {
	if len(s) < 4 {
		return calDate{}, false
	}
	y, err := strconv.Atoi(s[:4])
	if err != nil || y < 0 {
		return calDate{}, false
	}
	rest := s[4:]
	switch {
	case rest == "":
		return calDate{y: y, m: 1, d: 1}, true
	case len(rest) == 2 && rest[0] == 'Q' && rest[1] >= '1' && rest[1] <= '4':
		return calDate{y: y, m: 3*int(rest[1]-'0') - 2, d: 1, quarterly: true}, true
	case len(rest) >= 3 && rest[0] == '-':
		m, err := strconv.Atoi(rest[1:3])
		if err != nil || m < 1 || m > 12 || (len(rest) != 3 && (len(rest) != 6 || rest[3] != '-')) {
			return calDate{}, false
		}
		d := 1
		if len(rest) == 6 {
			if d, err = strconv.Atoi(rest[4:6]); err != nil || d < 1 || d > 31 {
				return calDate{}, false
			}
		}
		return calDate{y: y, m: m, d: d}, true
	}
	return calDate{}, false
}

// fitTicks reports whether labels fit side by side under a plot: at most
// most of them, each as wide as the widest plus a gap.
func fitTicks(labels []string, most int) bool {
	if len(labels) < 2 || len(labels) > most {
		return false
	}
	w := 0.0
	for _, l := range labels {
		w = max(w, textWidth(l))
	}
	return float64(len(labels))*(w+24) <= svgWidth-100
}

// yearSteps and quarterSteps are the spacings tried, finest first.
var (
	yearSteps    = []int{1, 2, 5, 10, 20, 25, 50, 100, 200, 500, 1000}
	quarterSteps = []int{1, 2}
)

// calendarTicks places ticks at calendar boundaries: at the first
// observation of every year (or every 2, 5, 10, ... years, on multiples of
// the step) when at least three years begin inside the sample, else at the
// first observation of every quarter (or every second quarter). It returns
// the ticks as 1-based observation numbers with their labels ("2008",
// "2008Q3" or "2008-07"), at most most of them and no more than fit side by
// side under a plot; none when the dates do not all parse or no spacing fits.
func calendarTicks(dates []string, most int) ([]float64, []string) {
	cal := make([]calDate, len(dates))
	for i, d := range dates {
		c, ok := parseCal(d)
		if !ok {
			return nil, nil
		}
		cal[i] = c
	}
	// Observations that open a year and a quarter; the first observation
	// does when it falls in the first week of the period's first month.
	var years, quarters []int
	for i, c := range cal {
		q := (c.m - 1) / 3
		early := c.d <= 7
		newYear := (i == 0 && c.m == 1 && early) || (i > 0 && c.y != cal[i-1].y)
		newQuarter := (i == 0 && c.m == 3*q+1 && early) || (i > 0 && (c.y != cal[i-1].y || q != (cal[i-1].m-1)/3))
		if newYear {
			years = append(years, i)
		}
		if newQuarter {
			quarters = append(quarters, i)
		}
	}
	if len(years) >= 3 {
		for _, step := range yearSteps {
			var ts []float64
			var ls []string
			for _, i := range years {
				if cal[i].y%step == 0 {
					ts = append(ts, float64(i+1))
					ls = append(ls, strconv.Itoa(cal[i].y))
				}
			}
			if fitTicks(ls, most) {
				return ts, ls
			}
		}
		return nil, nil
	}
	for _, step := range quarterSteps {
		var ts []float64
		var ls []string
		for _, i := range quarters {
			c := cal[i]
			q := (c.m-1)/3 + 1
			if (q-1)%step != 0 {
				continue
			}
			ts = append(ts, float64(i+1))
			if c.quarterly {
				ls = append(ls, strconv.Itoa(c.y)+"Q"+strconv.Itoa(q))
			} else {
				m := 3*q - 2
				ls = append(ls, strconv.Itoa(c.y)+"-"+string(rune('0'+m/10))+string(rune('0'+m%10)))
			}
		}
		if fitTicks(ls, most) {
			return ts, ls
		}
	}
	return nil, nil
}
