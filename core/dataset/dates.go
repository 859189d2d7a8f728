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

// parseDate reads one date cell in any accepted form that needs no
// column context (sample-range and break-date specs): a numeric
// day-month-year triple with the year last is accepted only when it is
// unambiguous (one number exceeds 12, or dots: day.month.year), a two-digit
// year after a month name uses the 1969-2068 window.
func parseDate(s string) (dval, bool) {
	c, ok := parseCell(s, 0)
	if !ok {
		return dval{}, false
	}
	v := c.v
	if c.amb {
		switch {
		case c.order == 'd' || (c.order == 0 && c.sep == '.'):
			v.m, v.d = v.d, v.m
		case c.order == 'm':
		default:
			return dval{}, false
		}
	}
	if c.yy {
		v.y = century(v.y)
	}
	if !valid(v) {
		return dval{}, false
	}
	return v, true
}

// century reads a two-digit year in the window 1969-2068.
func century(yy int) int {
	if yy >= 69 {
		return 1900 + yy
	}
	return 2000 + yy
}

// cellDate is one date cell before the column decides what it cannot:
// amb marks a numeric triple "a/b/YYYY" whose day-month order is open (v.m
// holds a, v.d holds b); yy marks a two-digit year (v.y is 0..99).
type cellDate struct {
	v     dval
	amb   bool
	order byte // for amb: 'm' only month/day/year is a valid day, 'd' only day/month/year, 0 both
	yy    bool
	sep   byte
}

// parseCell reads one cell. ints is the length of whole numbers read as
// dates: 0 none, 5 year-quarter (20051), 6 year-month (200501), 8
// year-month-day (20050131), -1 all three.
func parseCell(s string, ints int) (cellDate, bool) {
	s = stripMidnight(trimSpace(s))
	var tk [5]tok
	n, ok := tokenize(s, &tk)
	if !ok {
		return cellDate{}, false
	}
	t := tk[:n]
	var c cellDate
	v := &c.v
	switch n {
	case 1:
		a := t[0]
		if !a.digit || a.sep != 0 {
			break
		}
		l := len(a.s)
		useInt := ints == -1 || ints == l
		switch {
		case l == 4:
			*v = dval{k: kYear, y: atoi(a.s)}
		case l == 5 && useInt:
			*v = dval{k: kQuarter, y: atoi(a.s[:4]), m: atoi(a.s[4:])}
		case l == 6 && useInt:
			*v = dval{k: kMonth, y: atoi(a.s[:4]), m: atoi(a.s[4:])}
		case l == 8 && useInt:
			*v = dval{k: kDay, y: atoi(a.s[:4]), m: atoi(a.s[4:6]), d: atoi(a.s[6:])}
		}
	case 2:
		a, b := t[0], t[1]
		switch {
		case isYear(a) && isSmall(b) && (b.sep == '-' || b.sep == '/'):
			*v = dval{k: kMonth, y: atoi(a.s), m: atoi(b.s)}
		case isYear(a) && isSmall(b) && b.sep == ':':
			*v = dval{k: kColon, y: atoi(a.s), m: atoi(b.s)}
		case isSmall(a) && isYear(b) && (b.sep == '/' || b.sep == '-' || b.sep == '.'):
			*v = dval{k: kMonth, y: atoi(b.s), m: atoi(a.s)}
		case monthOf(a) > 0 && isYear(b) && b.sep != ':':
			*v = dval{k: kMonth, y: atoi(b.s), m: monthOf(a)}
		case monthOf(a) > 0 && b.digit && len(b.s) == 2 && (b.sep == '-' || b.sep == ' ' || b.sep == 0):
			*v = dval{k: kMonth, y: atoi(b.s), m: monthOf(a)}
			c.yy = true
		case isYear(a) && monthOf(b) > 0 && b.sep != 0 && b.sep != ':':
			*v = dval{k: kMonth, y: atoi(a.s), m: monthOf(b)}
		}
	case 3:
		a, b, d := t[0], t[1], t[2]
		switch {
		case isYear(a) && !b.digit && isSmall(d) && d.sep == 0 && (b.s == "Q" || b.s == "q") && b.sep != ':':
			*v = dval{k: kQuarter, y: atoi(a.s), m: atoi(d.s)}
		case isYear(a) && !b.digit && isSmall(d) && d.sep == 0 && (b.s == "M" || b.s == "m") && b.sep == 0:
			*v = dval{k: kMonth, y: atoi(a.s), m: atoi(d.s)}
		case !a.digit && (a.s == "Q" || a.s == "q") && isSmall(b) && b.sep == 0 && isYear(d) && d.sep != ':':
			*v = dval{k: kQuarter, y: atoi(d.s), m: atoi(b.s)}
		case isYear(a) && isSmall(b) && isSmall(d) && (b.sep == '-' || b.sep == '/' || b.sep == '.') && d.sep == b.sep:
			*v = dval{k: kDay, y: atoi(a.s), m: atoi(b.s), d: atoi(d.s)}
		case isSmall(a) && isSmall(b) && isYear(d) && (b.sep == '.' || b.sep == '/' || b.sep == '-') && d.sep == b.sep:
			*v = dval{k: kDay, y: atoi(d.s), m: atoi(a.s), d: atoi(b.s)}
			c.amb, c.sep = true, b.sep
		case monthOf(a) > 0 && isSmall(b) && isYear(d) && b.sep == ' ' && (d.sep == ' ' || d.sep == ','):
			*v = dval{k: kDay, y: atoi(d.s), m: monthOf(a), d: atoi(b.s)}
		case isSmall(a) && monthOf(b) > 0 && isYear(d) && (b.sep == ' ' || b.sep == '-') && d.sep == b.sep:
			*v = dval{k: kDay, y: atoi(d.s), m: monthOf(b), d: atoi(a.s)}
		case isYear(a) && monthOf(b) > 0 && isSmall(d) && (b.sep == '-' || b.sep == ' ') && d.sep == b.sep:
			*v = dval{k: kDay, y: atoi(a.s), m: monthOf(b), d: atoi(d.s)}
		}
	}
	if v.k == kNone {
		return cellDate{}, false
	}
	if c.amb {
		// order records which readings are valid days: 'm' month/day/year
		// only, 'd' day/month/year only, 0 both.
		a, b := v.m, v.d
		ok1 := valid(dval{k: kDay, y: v.y, m: a, d: b})
		ok2 := valid(dval{k: kDay, y: v.y, m: b, d: a})
		switch {
		case ok1 && ok2:
		case ok1:
			c.order = 'm'
		case ok2:
			c.order = 'd'
		default:
			return cellDate{}, false
		}
		return c, true
	}
	if c.yy {
		if v.y < 0 || v.y > 99 || v.m < 1 || v.m > 12 {
			return cellDate{}, false
		}
		return c, true
	}
	if !valid(*v) {
		return cellDate{}, false
	}
	return c, true
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

// DateFormats lists the accepted values of Options.DateFormat (and of the
// date_format setting): "dmy" and "mdy" fix the order of numeric
// day-month-year dates with the year last (31/01/2005, 01/31/2005, with '/',
// '.' or '-'); "yyyymm", "yyyyq" and "yyyymmdd" read whole numbers of that
// shape (200501, 20051, 20050131) as dates in any column. "" detects.
var DateFormats = []string{"", "dmy", "mdy", "yyyymm", "yyyyq", "yyyymmdd"}

// AcceptedDateForms is the list of date forms named in errors.
const AcceptedDateForms = "2005; 2005Q1, Q1 2005, 2005-Q1, 2005:1; 2005-01, 2005M01, 01/2005, Jan 2005, " +
	"January 2005, Jan-05, 2005-Jan; 2005-01-31, 31/01/2005, 01/31/2005, 31.01.2005, Jan 31 2005, " +
	"31 Jan 2005; and in a date-named column 200501 (year-month), 20051 (year-quarter), 20050131"

// dateOpts is a parsed DateFormat.
type dateOpts struct {
	order byte // 'd' day/month/year, 'm' month/day/year, 0 detect
	ints  int  // see parseCell
	name  string
}

// parseDateFormat reads a DateFormat value; ints is the integer forms
// allowed without one (-1 in a date-named column, 0 elsewhere).
func parseDateFormat(f string, ints int) (dateOpts, error) {
	switch strings.ToLower(trimSpace(f)) {
	case "":
		return dateOpts{ints: ints}, nil
	case "dmy":
		return dateOpts{order: 'd', ints: ints, name: "dmy"}, nil
	case "mdy":
		return dateOpts{order: 'm', ints: ints, name: "mdy"}, nil
	case "yyyymm":
		return dateOpts{ints: 6, name: "yyyymm"}, nil
	case "yyyyq":
		return dateOpts{ints: 5, name: "yyyyq"}, nil
	case "yyyymmdd":
		return dateOpts{ints: 8, name: "yyyymmdd"}, nil
	}
	return dateOpts{}, wrapf(ErrBadDate, "date_format %q: want one of dmy, mdy, yyyymm, yyyyq, yyyymmdd", f)
}

// gap is a run of missing periods in a regular date column: the periods
// first..last (canonical labels), missing of them, before observation i.
type gap struct {
	i           int
	missing     int
	first, last string
}

// dateNote is a finding about a date column; i is the cell index or -1.
type dateNote struct {
	i    int
	kind string
	msg  string
}

// dateColumn is a parsed date column.
type dateColumn struct {
	kind   kind
	freq   string
	labels []string
	warn   string
	gaps   []gap
	notes  []dateNote
}

// dateColumnError is the failure of parseDates at cell index i; parsed is
// the number of cells that were dates of some form.
type dateColumnError struct {
	i      int
	err    error
	parsed int
}

var kindNames = map[kind]string{kYear: "annual", kQuarter: "quarterly", kMonth: "monthly", kDay: "daily", kColon: "year:period"}

// parseDates parses a whole date column: every cell must be a date of one
// kind; the day-month order of numeric dates and the century of two-digit
// years are decided from the whole column; "2009:1" forms are resolved;
// daily dates that are all on one day of the month become months (quarters,
// years); order is checked and the frequency and calendar gaps detected. On
// failure it returns the index of the bad cell.
func parseDates(cells []string, o dateOpts) (*dateColumn, *dateColumnError) {
	if len(cells) == 0 {
		return nil, &dateColumnError{0, wrapf(ErrBadDate, "no dates"), 0}
	}
	cs := make([]cellDate, len(cells))
	bad, parsed := -1, 0
	count := map[kind]int{}
	for i, c := range cells {
		cd, ok := parseCell(c, o.ints)
		if !ok {
			if bad < 0 {
				bad = i
			}
			continue
		}
		cs[i] = cd
		parsed++
		count[cd.v.k]++
	}
	if bad >= 0 {
		return nil, &dateColumnError{bad, fmt.Errorf("%w (accepted forms: %s)", ErrBadDate, AcceptedDateForms), parsed}
	}
	major := cs[0].v.k
	for k, n := range count {
		if n > count[major] || (n == count[major] && k < major) {
			major = k
		}
	}
	for i, c := range cs {
		if c.v.k != major {
			return nil, &dateColumnError{i, wrapf(ErrBadDate, "a %s date among %s dates", kindNames[c.v.k], kindNames[major]), parsed}
		}
	}
	var notes []dateNote
	// Day-month order of numeric triples.
	order := o.order
	firstM, firstD, firstAmb := -1, -1, -1
	for i, c := range cs {
		if !c.amb {
			continue
		}
		switch c.order {
		case 'm':
			if firstM < 0 {
				firstM = i
			}
		case 'd':
			if firstD < 0 {
				firstD = i
			}
		}
		if firstAmb < 0 {
			firstAmb = i
		}
	}
	if firstAmb >= 0 {
		switch {
		case order == 'd' && firstM >= 0:
			return nil, &dateColumnError{firstM, wrapf(ErrBadDate, "not a day/month/year date (date_format dmy)"), parsed}
		case order == 'm' && firstD >= 0:
			return nil, &dateColumnError{firstD, wrapf(ErrBadDate, "not a month/day/year date (date_format mdy)"), parsed}
		case order != 0:
		case firstM >= 0 && firstD >= 0:
			return nil, &dateColumnError{max(firstM, firstD), wrapf(ErrBadDate,
				"the column mixes day/month/year (%q) and month/day/year (%q) dates", cells[firstD], cells[firstM]), parsed}
		case firstM >= 0:
			order = 'm'
			notes = append(notes, dateNote{-1, "date-format", fmt.Sprintf("dates read as month/day/year (%q has no other reading)", cells[firstM])})
		case firstD >= 0:
			order = 'd'
			notes = append(notes, dateNote{-1, "date-format", fmt.Sprintf("dates read as day/month/year (%q has no other reading)", cells[firstD])})
		case cs[firstAmb].sep == '.':
			order = 'd'
			notes = append(notes, dateNote{-1, "date-format", "dotted dates read as day.month.year (set date_format (--date-format) to mdy for month.day.year)"})
		default:
			dD, eD := finishDates(cells, resolveOrder(cs, 'd'))
			dM, eM := finishDates(cells, resolveOrder(cs, 'm'))
			regD := eD == nil && dD.freq != Irregular && len(dD.gaps) == 0
			regM := eM == nil && dM.freq != Irregular && len(dM.gaps) == 0
			if regD != regM {
				dc, reading, other := dD, "day/month/year", "month/day/year"
				if regM {
					dc, reading, other = dM, "month/day/year", "day/month/year"
				}
				dc.notes = append(notes, dateNote{-1, "date-format", fmt.Sprintf(
					"dates such as %q read as %s: the only order that gives regular dates (as %s they would not be); set date_format (--date-format) to override",
					cells[firstAmb], reading, other)})
				return dc, nil
			}
			return nil, &dateColumnError{firstAmb, wrapf(ErrAmbiguousDate,
				"this and the other dates of the column read as day/month/year or as month/day/year: set date_format (--date-format) to dmy or mdy"), parsed}
		}
	}
	vs := resolveOrder(cs, order)
	dc, e := finishDates(cells, vs)
	if e != nil {
		e.parsed = parsed
		return nil, e
	}
	dc.notes = append(notes, dc.notes...)
	return dc, nil
}

// resolveOrder returns the dates of cs with numeric triples read in order
// ('d' or 'm') and two-digit years given a century: the first year in
// 1969-2068 unless the column would then end after 2068, later years moving
// on a century whenever the two digits fall.
func resolveOrder(cs []cellDate, order byte) []dval {
	vs := make([]dval, len(cs))
	var yy []int
	for i, c := range cs {
		v := c.v
		if c.amb {
			if order == 'd' {
				v.m, v.d = v.d, v.m
			}
			v.k = kDay
		}
		vs[i] = v
		if c.yy {
			yy = append(yy, i)
		}
	}
	if len(yy) > 0 {
		rel := make([]int, len(yy))
		off := 0
		for j, i := range yy {
			if j > 0 && vs[i].y < vs[yy[j-1]].y {
				off += 100
			}
			rel[j] = vs[i].y + off
		}
		base := 2000
		if rel[0] >= 69 || rel[len(rel)-1] > 68 {
			base = 1900
		}
		for j, i := range yy {
			vs[i].y = base + rel[j]
		}
	}
	return vs
}

// gcd of two positive integers.
func gcd(a, b int) int {
	for b != 0 {
		a, b = b, a%b
	}
	return a
}

// finishDates resolves "2009:1" forms, reduces daily dates on one day of
// the month, checks order and detects the frequency and gaps.
func finishDates(cells []string, vs []dval) (*dateColumn, *dateColumnError) {
	for i, v := range vs {
		if !valid(v) {
			return nil, &dateColumnError{i, fmt.Errorf("%w (accepted forms: %s)", ErrBadDate, AcceptedDateForms), 0}
		}
	}
	k := vs[0].k
	var notes []dateNote
	if k == kColon {
		maxSub := 0
		for _, v := range vs {
			maxSub = max(maxSub, v.m)
		}
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
			if len(vs) > 1 && !(same && vs[0].d == 1) {
				what := "the month's last day"
				if same {
					what = fmt.Sprintf("day %d of the month", vs[0].d)
				}
				notes = append(notes, dateNote{-1, "date-period", fmt.Sprintf("daily dates all on %s read as periods (months, quarters or years from their spacing)", what)})
			}
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
			return nil, &dateColumnError{i, wrapf(ErrDateOrder, "%q does not come after %q", cells[i], cells[i-1]), 0}
		}
	}
	// Monthly positions a multiple of three or twelve months apart (every
	// month in the same place of its quarter or year) are quarters or years.
	if k == kMonth && len(vs) > 1 {
		g := 0
		for i := 1; i < len(ord); i++ {
			g = gcd(ord[i]-ord[i-1], g)
		}
		if g == 3 || g == 6 || g == 9 {
			k = kQuarter
			for i := range vs {
				vs[i] = dval{k: kQuarter, y: vs[i].y, m: (vs[i].m-1)/3 + 1}
				ord[i] = ordinal(vs[i])
			}
		} else if g%12 == 0 {
			k = kYear
			for i := range vs {
				vs[i] = dval{k: kYear, y: vs[i].y}
				ord[i] = ordinal(vs[i])
			}
		}
	}
	dc := &dateColumn{kind: k, labels: make([]string, len(vs)), notes: notes}
	for i, v := range vs {
		dc.labels[i] = label(v)
	}
	dc.freq, dc.gaps, dc.warn = frequency(k, vs, ord)
	return dc, nil
}

// ordLabel is the canonical label of ordinal o of kind k.
func ordLabel(k kind, o int) string {
	switch k {
	case kYear:
		return label(dval{k: kYear, y: o})
	case kQuarter:
		return label(dval{k: kQuarter, y: o / 4, m: o%4 + 1})
	case kMonth:
		return label(dval{k: kMonth, y: o / 12, m: o%12 + 1})
	}
	return time.Unix(int64(o)*86400, 0).UTC().Format("2006-01-02")
}

// gapsOf lists the runs of missing periods between ordinals step apart.
func gapsOf(k kind, ord []int, step int) []gap {
	var gs []gap
	for i := 1; i < len(ord); i++ {
		if d := ord[i] - ord[i-1]; d > step {
			gs = append(gs, gap{i: i, missing: d/step - 1, first: ordLabel(k, ord[i-1]+step), last: ordLabel(k, ord[i]-step)})
		}
	}
	return gs
}

// frequency detects the frequency from the spacing of ordinals: annual,
// quarterly, monthly and weekly data may have calendar gaps (returned);
// daily data are calendar or business days, anything else is irregular
// (warn names the first gap).
func frequency(k kind, vs []dval, ord []int) (string, []gap, string) {
	unit := map[kind]string{kYear: Annual, kQuarter: Quarterly, kMonth: Monthly, kDay: Daily}[k]
	if k != kDay {
		return unit, gapsOf(k, ord, 1), ""
	}
	gap := -1
	for i := 1; i < len(ord); i++ {
		if ord[i]-ord[i-1] != 1 {
			gap = i
			break
		}
	}
	if gap < 0 {
		return Daily, nil, ""
	}
	weekly := len(ord) > 1
	for i := 1; i < len(ord) && weekly; i++ {
		weekly = (ord[i]-ord[i-1])%7 == 0
	}
	if weekly {
		return Weekly, gapsOf(k, ord, 7), ""
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
		return Daily, nil, ""
	}
	return Irregular, nil, fmt.Sprintf("dates are irregular (%s data with a gap between %s and %s)",
		unit, label(vs[gap-1]), label(vs[gap]))
}

// seriesGaps lists the calendar gaps of canonical date labels of a regular
// frequency (annual, quarterly, monthly, weekly); nil for other frequencies.
func seriesGaps(dates []string, freq string) []gap {
	k, step := kNone, 1
	switch freq {
	case Annual:
		k = kYear
	case Quarterly:
		k = kQuarter
	case Monthly:
		k = kMonth
	case Weekly:
		k, step = kDay, 7
	default:
		return nil
	}
	ord := make([]int, len(dates))
	for i, d := range dates {
		v, ok := parseDate(d)
		if !ok || v.k != k {
			return nil
		}
		ord[i] = ordinal(v)
	}
	return gapsOf(k, ord, step)
}

// describeGaps lists gaps in words: "1958-06, 1958-10..1958-11 (3 missing
// months in 2 gaps)"; at most ten gaps are listed.
func describeGaps(gs []gap, freq string) string {
	unit := map[string]string{Annual: "years", Quarterly: "quarters", Monthly: "months", Weekly: "weeks"}[freq]
	var b strings.Builder
	total := 0
	for j, g := range gs {
		total += g.missing
		if j < 10 {
			if j > 0 {
				b.WriteString(", ")
			}
			b.WriteString(g.first)
			if g.missing > 1 {
				b.WriteString("..")
				b.WriteString(g.last)
			}
		}
	}
	if len(gs) > 10 {
		fmt.Fprintf(&b, " and %d more gaps", len(gs)-10)
	}
	if total == 1 {
		unit = strings.TrimSuffix(unit, "s")
	}
	fmt.Fprintf(&b, " (%d missing %s in %d gap", total, unit, len(gs))
	if len(gs) > 1 {
		b.WriteString("s")
	}
	b.WriteString(")")
	return b.String()
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
