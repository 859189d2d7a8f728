package dataset

import (
	"fmt"
	"strconv"
	"strings"
	"time"
)

// Frequencies reported in Table.Frequency and Series.Frequency.
const (
	Annual    = "annual"
	Quarterly = "quarterly"
	Monthly   = "monthly"
	Weekly    = "weekly"
	Daily     = "daily"
	Irregular = "irregular"
)

// kind is the resolution of a date cell.
type kind uint8

const (
	kNone kind = iota
	kYear
	kQuarter
	kMonth
	kDay
	kColon // "2009:1": quarter or month, decided by the column
)

// dval is one parsed date cell. For kQuarter m is the quarter 1..4; for
// kColon m is the sub-period as written.
type dval struct {
	k       kind
	y, m, d int
}

var monthNames = map[string]int{
	"jan": 1, "feb": 2, "mar": 3, "apr": 4, "may": 5, "jun": 6, "jul": 7, "aug": 8,
	"sep": 9, "sept": 9, "oct": 10, "nov": 11, "dec": 12,
	"january": 1, "february": 2, "march": 3, "april": 4, "june": 6, "july": 7,
	"august": 8, "september": 9, "october": 10, "november": 11, "december": 12,
}

// tok is a run of digits or letters in a date cell.
type tok struct {
	s     string
	digit bool
	sep   byte // separator before this token: 0 none, ' ', '-', '/', '.', ',', ':'
}

// tokenize splits a date cell; ok is false on characters no date form uses or
// when there are more than four tokens.
func tokenize(s string, out *[5]tok) (int, bool) {
	n := 0
	var sep byte
	for i := 0; i < len(s); {
		c := s[i]
		switch {
		case c >= '0' && c <= '9', c|0x20 >= 'a' && c|0x20 <= 'z':
			digit := c <= '9'
			j := i + 1
			for j < len(s) {
				d := s[j]
				if digit != (d >= '0' && d <= '9') || !(d >= '0' && d <= '9' || d|0x20 >= 'a' && d|0x20 <= 'z') {
					break
				}
				j++
			}
			if n == 4 || j-i > 9 {
				return 0, false
			}
			out[n] = tok{s: s[i:j], digit: digit, sep: sep}
			n++
			sep = 0
			i = j
		case c == ' ' || c == '-' || c == '/' || c == '.' || c == ',' || c == ':':
			if sep != 0 && !(sep == ',' && c == ' ') && !(sep == ' ' && c == ' ') {
				return 0, false
			}
			if sep == 0 || c != ' ' {
				sep = c
			}
			i++
		default:
			return 0, false
		}
	}
	return n, n > 0
}

// stripMidnight removes a midnight time after an ISO date.
func stripMidnight(s string) string {
	if len(s) <= 10 || (s[10] != 'T' && s[10] != ' ') {
		return s
	}
	for i := 11; i < len(s); i++ {
		switch s[i] {
		case '0', ':', '.', 'Z', '+', '-':
		default:
			return s
		}
	}
	return s[:10]
}

func atoi(s string) int {
	v, err := strconv.Atoi(s)
	if err != nil {
		return -1
	}
	return v
}

func isYear(t tok) bool { return t.digit && len(t.s) == 4 }

func isSmall(t tok) bool { return t.digit && len(t.s) <= 2 }

func monthOf(t tok) int {
	if t.digit || len(t.s) < 3 {
		return 0
	}
	return monthNames[strings.ToLower(t.s)]
}

// parseDate reads one date cell in any accepted form.
func parseDate(s string) (dval, bool) {
	s = stripMidnight(trimSpace(s))
	var tk [5]tok
	n, ok := tokenize(s, &tk)
	if !ok {
		return dval{}, false
	}
	t := tk[:n]
	var v dval
	switch n {
	case 1:
		if isYear(t[0]) && t[0].sep == 0 {
			v = dval{k: kYear, y: atoi(t[0].s)}
		}
	case 2:
		switch {
		case isYear(t[0]) && isSmall(t[1]) && (t[1].sep == '-' || t[1].sep == '/'):
			v = dval{k: kMonth, y: atoi(t[0].s), m: atoi(t[1].s)}
		case isYear(t[0]) && isSmall(t[1]) && t[1].sep == ':':
			v = dval{k: kColon, y: atoi(t[0].s), m: atoi(t[1].s)}
		case isSmall(t[0]) && isYear(t[1]) && (t[1].sep == '/' || t[1].sep == '-'):
			v = dval{k: kMonth, y: atoi(t[1].s), m: atoi(t[0].s)}
		case monthOf(t[0]) > 0 && isYear(t[1]) && t[1].sep != ':':
			v = dval{k: kMonth, y: atoi(t[1].s), m: monthOf(t[0])}
		case isYear(t[0]) && monthOf(t[1]) > 0 && t[1].sep != 0 && t[1].sep != ':':
			v = dval{k: kMonth, y: atoi(t[0].s), m: monthOf(t[1])}
		}
	case 3:
		a, b, c := t[0], t[1], t[2]
		switch {
		case isYear(a) && !b.digit && isSmall(c) && c.sep == 0 && (b.s == "Q" || b.s == "q") && b.sep != ':':
			v = dval{k: kQuarter, y: atoi(a.s), m: atoi(c.s)}
		case isYear(a) && !b.digit && isSmall(c) && c.sep == 0 && (b.s == "M" || b.s == "m") && b.sep == 0:
			v = dval{k: kMonth, y: atoi(a.s), m: atoi(c.s)}
		case !a.digit && (a.s == "Q" || a.s == "q") && isSmall(b) && b.sep == 0 && isYear(c) && c.sep != ':':
			v = dval{k: kQuarter, y: atoi(c.s), m: atoi(b.s)}
		case isYear(a) && isSmall(b) && isSmall(c) && (b.sep == '-' || b.sep == '/' || b.sep == '.') && c.sep == b.sep:
			v = dval{k: kDay, y: atoi(a.s), m: atoi(b.s), d: atoi(c.s)}
		case isSmall(a) && isSmall(b) && isYear(c) && b.sep == '.' && c.sep == '.':
			v = dval{k: kDay, y: atoi(c.s), m: atoi(b.s), d: atoi(a.s)}
		case monthOf(a) > 0 && isSmall(b) && isYear(c) && b.sep == ' ' && (c.sep == ' ' || c.sep == ','):
			v = dval{k: kDay, y: atoi(c.s), m: monthOf(a), d: atoi(b.s)}
		case isSmall(a) && monthOf(b) > 0 && isYear(c) && (b.sep == ' ' || b.sep == '-') && c.sep == b.sep:
			v = dval{k: kDay, y: atoi(c.s), m: monthOf(b), d: atoi(a.s)}
		}
	}
	if !valid(v) {
		return dval{}, false
	}
	return v, true
}

func daysIn(y, m int) int {
	switch m {
	case 2:
		if y%4 == 0 && (y%100 != 0 || y%400 == 0) {
			return 29
		}
		return 28
	case 4, 6, 9, 11:
		return 30
	}
	return 31
}

func valid(v dval) bool {
	if v.k == kNone || v.y < 1000 || v.y > 2999 {
		return false
	}
	switch v.k {
	case kQuarter:
		return v.m >= 1 && v.m <= 4
	case kMonth, kColon:
		return v.m >= 1 && v.m <= 12
	case kDay:
		return v.m >= 1 && v.m <= 12 && v.d >= 1 && v.d <= daysIn(v.y, v.m)
	}
	return true
}

// dayNumber is the number of days since 1970-01-01.
func dayNumber(y, m, d int) int {
	return int(time.Date(y, time.Month(m), d, 0, 0, 0, 0, time.UTC).Unix() / 86400)
}

// ordinal is the position of v on the time axis of its kind.
func ordinal(v dval) int {
	switch v.k {
	case kYear:
		return v.y
	case kQuarter:
		return v.y*4 + v.m - 1
	case kMonth:
		return v.y*12 + v.m - 1
	case kDay:
		return dayNumber(v.y, v.m, v.d)
	}
	return 0
}

// label is the canonical label of v.
func label(v dval) string {
	switch v.k {
	case kYear:
		return fmt.Sprintf("%04d", v.y)
	case kQuarter:
		return fmt.Sprintf("%04dQ%d", v.y, v.m)
	case kMonth:
		return fmt.Sprintf("%04d-%02d", v.y, v.m)
	case kDay:
		return fmt.Sprintf("%04d-%02d-%02d", v.y, v.m, v.d)
	}
	return ""
}

// dateColumn is a parsed date column.
type dateColumn struct {
	kind   kind
	freq   string
	labels []string
	warn   string
}

// dateColumnError is the failure of parseDateColumn at cell index i.
type dateColumnError struct {
	i   int
	err error
}

// parseDates parses a whole date column, resolving "2009:1" forms, reducing
// daily dates that are all on one day of the month, checking order and
// detecting the frequency. On failure it returns the index of the bad cell.
func parseDates(cells []string) (*dateColumn, *dateColumnError) {
	if len(cells) == 0 {
		return nil, &dateColumnError{0, wrapf(ErrBadDate, "no dates")}
	}
	vs := make([]dval, len(cells))
	maxSub := 0
	for i, c := range cells {
		v, ok := parseDate(c)
		if !ok {
			return nil, &dateColumnError{i, ErrBadDate}
		}
		if i > 0 && v.k != vs[0].k {
			return nil, &dateColumnError{i, wrapf(ErrBadDate, "date form differs from the first row's")}
		}
		vs[i] = v
		maxSub = max(maxSub, v.m)
	}
	k := vs[0].k
	if k == kColon {
		k = kMonth
		if maxSub <= 4 {
			k = kQuarter
		}
		for i := range vs {
			vs[i].k = k
		}
	}
	if k == kDay && (len(vs) > 1 || vs[0].d == 1) {
		same, ends := true, true
		for _, v := range vs {
			same = same && v.d == vs[0].d
			ends = ends && v.d == daysIn(v.y, v.m)
		}
		if same || ends {
			k = kMonth
			for i := range vs {
				vs[i].k, vs[i].d = kMonth, 0
			}
		}
	}
	ord := make([]int, len(vs))
	for i, v := range vs {
		ord[i] = ordinal(v)
		if i > 0 && ord[i] <= ord[i-1] {
			return nil, &dateColumnError{i, wrapf(ErrDateOrder, "%q does not come after %q", cells[i], cells[i-1])}
		}
	}
	// Monthly positions three or twelve months apart are quarters or years.
	if k == kMonth && len(vs) > 1 {
		step := ord[1] - ord[0]
		all := step == 3 || step == 12
		for i := 2; i < len(ord) && all; i++ {
			all = ord[i]-ord[i-1] == step
		}
		if all && step == 3 {
			k = kQuarter
			for i := range vs {
				vs[i] = dval{k: kQuarter, y: vs[i].y, m: (vs[i].m-1)/3 + 1}
				ord[i] = ordinal(vs[i])
			}
		} else if all && step == 12 {
			k = kYear
			for i := range vs {
				vs[i] = dval{k: kYear, y: vs[i].y}
				ord[i] = ordinal(vs[i])
			}
		}
	}
	dc := &dateColumn{kind: k, labels: make([]string, len(vs))}
	for i, v := range vs {
		dc.labels[i] = label(v)
	}
	dc.freq, dc.warn = frequency(k, vs, ord)
	return dc, nil
}

// frequency detects the frequency from the spacing of ordinals.
func frequency(k kind, vs []dval, ord []int) (string, string) {
	unit := map[kind]string{kYear: Annual, kQuarter: Quarterly, kMonth: Monthly, kDay: Daily}[k]
	gap := -1
	for i := 1; i < len(ord); i++ {
		if ord[i]-ord[i-1] != 1 {
			gap = i
			break
		}
	}
	if gap < 0 {
		return unit, ""
	}
	if k == kDay {
		weekly := true
		for i := 1; i < len(ord) && weekly; i++ {
			weekly = ord[i]-ord[i-1] == 7
		}
		if weekly {
			return Weekly, ""
		}
		business, ones := true, 0
		for i := range ord {
			wd := time.Date(vs[i].y, time.Month(vs[i].m), vs[i].d, 0, 0, 0, 0, time.UTC).Weekday()
			if wd == time.Saturday || wd == time.Sunday {
				business = false
				break
			}
			if i > 0 {
				st := ord[i] - ord[i-1]
				if st > 5 {
					business = false
					break
				}
				if st == 1 {
					ones++
				}
			}
		}
		if business && 2*ones >= len(ord)-1 {
			return Daily, ""
		}
	}
	return Irregular, fmt.Sprintf("dates are irregular (%s data with a gap between %s and %s)",
		unit, label(vs[gap-1]), label(vs[gap]))
}

// kindOf is the kind of the canonical labels of a frequency; for irregular
// data it is read from the first label.
func kindOf(dates []string, freq string) kind {
	switch freq {
	case Annual:
		return kYear
	case Quarterly:
		return kQuarter
	case Monthly:
		return kMonth
	case Weekly, Daily:
		return kDay
	}
	if len(dates) > 0 {
		if v, ok := parseDate(dates[0]); ok {
			return v.k
		}
	}
	return kNone
}

// firstDay and lastDay bound the days a date covers.
func firstDay(v dval) dval {
	switch v.k {
	case kYear:
		return dval{kDay, v.y, 1, 1}
	case kQuarter:
		return dval{kDay, v.y, 3*v.m - 2, 1}
	case kMonth:
		return dval{kDay, v.y, v.m, 1}
	}
	return v
}

func lastDay(v dval) dval {
	switch v.k {
	case kYear:
		return dval{kDay, v.y, 12, 31}
	case kQuarter:
		return dval{kDay, v.y, 3 * v.m, daysIn(v.y, 3*v.m)}
	case kMonth:
		return dval{kDay, v.y, v.m, daysIn(v.y, v.m)}
	}
	return v
}

// ordinalIn is the ordinal, in kind k, of the period holding the day v.
func ordinalIn(k kind, v dval) int {
	y, m, d := v.y, v.m, v.d
	switch k {
	case kYear:
		return y
	case kQuarter:
		return y*4 + (m-1)/3
	case kMonth:
		return y*12 + m - 1
	}
	return dayNumber(y, m, d)
}

// searchMode selects how resolve matches a date.
type searchMode uint8

const (
	exact searchMode = iota
	atOrAfter
	atOrBefore
)

// IndexOf resolves a date (any accepted form, converted to the frequency of
// dates) or an observation number 1..len(dates) to a 1-based index into
// dates. A 4-digit number is a year when dates are given and the year lies
// within their span or exceeds the number of observations, else an
// observation number. With nil dates only
// observation numbers are accepted and not bounded above. A date must name
// exactly one period of the data ("2009" is not a quarter) and be present.
func IndexOf(dates []string, freq string, spec string) (int, error) {
	n := len(dates)
	if dates == nil {
		n = -1
	}
	return resolve(n, dates, freq, spec, exact)
}

// resolve is IndexOf with a search mode: atOrAfter gives the first date at or
// after the start of the period named, atOrBefore the last at or before its
// end. n is the number of observations (-1: unbounded).
func resolve(n int, dates []string, freq string, spec string, mode searchMode) (int, error) {
	spec = trimSpace(spec)
	if spec == "" {
		return 0, wrapf(ErrBadRange, "empty date or observation number")
	}
	allDigits := true
	for i := 0; i < len(spec); i++ {
		allDigits = allDigits && spec[i] >= '0' && spec[i] <= '9'
	}
	if allDigits && len(dates) > 0 && len(spec) == 4 {
		// A year when it lies within the dates' span or cannot be an
		// observation number.
		y := atoi(spec)
		f, _ := parseDate(dates[0])
		l, _ := parseDate(dates[len(dates)-1])
		inSpan := y >= f.y && y <= l.y
		allDigits = !inSpan && (n < 0 || y <= n || y < 1000)
	}
	if allDigits {
		i, err := strconv.Atoi(spec)
		if err != nil || i < 1 || (n >= 0 && i > n) {
			if n >= 0 {
				return 0, wrapf(ErrBadRange, "observation %s outside 1..%d", spec, n)
			}
			return 0, wrapf(ErrBadRange, "observation %s is not a positive number", spec)
		}
		return i, nil
	}
	if len(dates) == 0 {
		return 0, wrapf(ErrBadRange, "%q: the data have no dates; give an observation number", spec)
	}
	k := kindOf(dates, freq)
	v, ok := parseDate(spec)
	if !ok || k == kNone {
		return 0, wrapf(ErrBadRange, "%q is neither a date nor an observation number", spec)
	}
	if v.k == kColon {
		switch k {
		case kQuarter:
			if v.m > 4 {
				return 0, wrapf(ErrBadRange, "%q: quarter %d", spec, v.m)
			}
			v.k = kQuarter
		case kMonth:
			v.k = kMonth
		default:
			return 0, wrapf(ErrBadRange, "%q is ambiguous for %s data", spec, freq)
		}
	}
	lo := ordinalIn(k, firstDay(v))
	hi := ordinalIn(k, lastDay(v))
	if mode == exact && lo != hi {
		return 0, wrapf(ErrBadRange, "%q covers several %s observations; name one", spec, freq)
	}
	ords := make([]int, len(dates))
	for i, d := range dates {
		dv, ok := parseDate(d)
		if !ok {
			return 0, wrapf(ErrBadDate, "date label %q", d)
		}
		ords[i] = ordinalIn(k, firstDay(dv))
	}
	switch mode {
	case exact:
		for i, o := range ords {
			if o == lo {
				return i + 1, nil
			}
		}
		return 0, wrapf(ErrBadRange, "%q is not among the dates (%s to %s)", spec, dates[0], dates[len(dates)-1])
	case atOrAfter:
		for i, o := range ords {
			if o >= lo {
				return i + 1, nil
			}
		}
		return 0, wrapf(ErrBadRange, "%q is after the last date %s", spec, dates[len(dates)-1])
	default:
		for i := len(ords) - 1; i >= 0; i-- {
			if ords[i] <= hi {
				return i + 1, nil
			}
		}
		return 0, wrapf(ErrBadRange, "%q is before the first date %s", spec, dates[0])
	}
}
