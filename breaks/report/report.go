package report

import (
	"errors"
	"fmt"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// Formats lists the accepted format names: "table", "json", "csv", "md",
// "latex", "html". The first is the default.
var Formats = []string{"table", "json", "csv", "md", "latex", "html"}

// ErrFormat is returned by Write for a format name not in Formats.
var ErrFormat = errors.New("report: unknown format")

// ErrNoDocument is returned by every writer when the document is nil.
var ErrNoDocument = errors.New("report: nil document")

// Write writes doc in the given format ("" means "table"; "markdown" and
// "tex" are accepted for "md" and "latex"). inputs are the prepared series
// aligned with doc.Series by index; they may be nil or contain nil Values,
// and plots are then omitted for that series. Only the HTML format uses them.
// The error wraps ErrFormat, ErrNoDocument or the writer's error.
func Write(w io.Writer, format string, doc *schema.Document, inputs []dataset.Series) error {
	switch strings.ToLower(strings.TrimSpace(format)) {
	case "", "table":
		return WriteTable(w, doc)
	case "json":
		return WriteJSON(w, doc)
	case "csv":
		return WriteCSV(w, doc)
	case "md", "markdown":
		return WriteMarkdown(w, doc)
	case "latex", "tex":
		return WriteLaTeX(w, doc)
	case "html":
		return WriteHTML(w, doc, inputs)
	}
	return fmt.Errorf("%w %q (want one of %s)", ErrFormat, format, strings.Join(Formats, ", "))
}

// errWriter keeps the first write error so that writers can print freely
// and check once at the end.
type errWriter struct {
	w   io.Writer
	err error
	// plain marks plain text (the table): print then also drops the folders
	// of file paths, which in the escaped formats their escaping does.
	plain bool
}

// print writes s with every control character other than the writer's own
// line breaks shown visibly: a last guard behind each format's escaping.
func (e *errWriter) print(s string) {
	if e.err != nil {
		return
	}
	s = visibleLines(s)
	if e.plain {
		s = noFolders(s)
	}
	_, e.err = io.WriteString(e.w, s)
}

func (e *errWriter) printf(format string, args ...any) {
	e.print(fmt.Sprintf(format, args...))
}

// sourceName is the base name of the document's source (no folders: a
// report must not carry the layout of the machine that ran it), or "".
func sourceName(doc *schema.Document) string {
	if doc.Source == nil {
		return ""
	}
	return SafeName(doc.Source.Name)
}

// caution is the document's caution, or the schema's when it has none:
// every report carries it.
func caution(doc *schema.Document) string {
	if doc.Caution != "" {
		return doc.Caution
	}
	return schema.Caution
}

// finite reports whether x is neither NaN nor ±Inf.
func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// num formats x with four decimals, or na when x is not finite.
func num(x float64, na string) string {
	if !finite(x) {
		return na
	}
	if x == 0 {
		x = 0 // no "-0.0000"
	}
	s := strconv.FormatFloat(x, 'f', 4, 64)
	if s == "-0.0000" {
		s = "0.0000"
	}
	return s
}

// numP formats *p with four decimals, or na when p is nil or not finite.
func numP(p *float64, na string) string {
	if p == nil {
		return na
	}
	return num(*p, na)
}

// cv returns the critical value at key ("0.05") and whether it exists.
func cv(m map[string]float64, key string) (float64, bool) {
	v, ok := m[key]
	if !ok || !finite(v) {
		return 0, false
	}
	return v, true
}

// nullKind classifies the null hypothesis of a result, which decides how a
// rejection is put in words.
type nullKind int

const (
	nullUnitRoot nullKind = iota
	nullStationary
	nullNoBreak
	nullExplosive // unit root against an explosive (right-tailed) alternative
	nullSeasonal  // unit roots at the seasonal frequencies (right-tailed F, not explosive)
)

// kindOf classifies r by its test id, its stated null and its tail.
func kindOf(r *schema.Result) nullKind {
	id := strings.ToLower(r.Test)
	null := strings.ToLower(r.Null)
	right := id == "sadf" || id == "gsadf" || r.Tail == "right"
	switch {
	case id == "seasonal":
		return nullSeasonal
	case strings.Contains(id, "kpss"):
		return nullStationary
	case id == "bp" || id == "py":
		return nullNoBreak
	case strings.Contains(null, "unit root"):
		if right {
			return nullExplosive
		}
		return nullUnitRoot
	case strings.Contains(null, "stationar"):
		return nullStationary
	case strings.Contains(null, "break") || strings.Contains(null, "structural") ||
		strings.Contains(null, "constancy"):
		return nullNoBreak
	case right:
		return nullExplosive
	}
	return nullUnitRoot
}

// decision puts a rejection decision in words for a result of kind k.
func decision(k nullKind, reject bool) string {
	switch k {
	case nullStationary:
		if reject {
			return "rejects stationarity"
		}
		return "cannot reject stationarity"
	case nullNoBreak:
		if reject {
			return "finds a break"
		}
		return "no break found"
	case nullExplosive:
		if reject {
			return "rejects unit root (explosive)"
		}
		return "cannot reject unit root"
	case nullSeasonal:
		if reject {
			return "rejects seasonal unit roots"
		}
		return "cannot reject seasonal unit roots"
	}
	if reject {
		return "rejects unit root"
	}
	return "cannot reject unit root"
}

// resultDecision is the decision in words for r, or "" when r has no
// statistic.
func resultDecision(r *schema.Result) string {
	if r.Statistic == nil || !finite(*r.Statistic) {
		if len(r.Components) > 0 || len(r.BreakTests) > 0 {
			return ""
		}
		return "no statistic"
	}
	return decision(kindOf(r), r.Reject)
}

// componentDecision is the decision for a component of r.
func componentDecision(r *schema.Result, c *schema.Component) string {
	if c.Statistic == nil || !finite(*c.Statistic) {
		return "no statistic"
	}
	k := kindOf(r)
	if k == nullSeasonal {
		// Each component tests the unit root(s) at its own frequency.
		return decision(nullUnitRoot, c.Reject)
	}
	if c.Tail != "" && k != nullStationary && k != nullNoBreak {
		if c.Tail == "right" {
			k = nullExplosive
		} else {
			k = nullUnitRoot
		}
	}
	return decision(k, c.Reject)
}

// breakLabel names observation index with its date when known.
func breakLabel(index int, date string) string {
	if date != "" {
		return visible(date)
	}
	return "obs " + strconv.Itoa(index)
}

// breakText describes one break: its date (or observation), the
// observation number and the confidence interval when there is one.
func breakText(b schema.Break) string {
	var sb strings.Builder
	sb.WriteString(breakLabel(b.Index, b.Date))
	var extra []string
	if b.Date != "" {
		extra = append(extra, "obs "+strconv.Itoa(b.Index))
	}
	if b.Lower > 0 && b.Upper > 0 {
		ci := breakLabel(b.Lower, b.LowerDate) + ".." + breakLabel(b.Upper, b.UpperDate)
		if p, ok := percent(b.CILevel); ok {
			ci = p + " CI " + ci
		} else {
			ci = "CI " + ci
		}
		extra = append(extra, ci)
	}
	if len(extra) > 0 {
		sb.WriteString(" (" + strings.Join(extra, "; ") + ")")
	}
	return sb.String()
}

// percent writes a level in (0, 1] as a percentage ("90%").
func percent(level float64) (string, bool) {
	if !(level > 0 && level <= 1) {
		return "", false
	}
	return strconv.FormatFloat(100*level, 'f', -1, 64) + "%", true
}

// breaksText joins the descriptions of bs with ", ".
func breaksText(bs []schema.Break) string {
	parts := make([]string, len(bs))
	for i, b := range bs {
		parts[i] = breakText(b)
	}
	return strings.Join(parts, ", ")
}

// breakDates lists the break dates (or observation numbers) of bs.
func breakDates(bs []schema.Break) []string {
	out := make([]string, len(bs))
	for i, b := range bs {
		if b.Date != "" {
			out[i] = b.Date
		} else {
			out[i] = strconv.Itoa(b.Index)
		}
	}
	return out
}

// episodeText describes explosive episodes.
func episodeText(es []schema.Episode) string {
	parts := make([]string, len(es))
	for i, e := range es {
		parts[i] = breakLabel(e.Start.Index, e.Start.Date) + ".." + breakLabel(e.End.Index, e.End.Date)
	}
	return strings.Join(parts, ", ")
}

// classWords puts a verdict class in words.
func classWords(class string) string {
	switch class {
	case "stationary":
		return "stationary"
	case "trend-stationary":
		return "stationary around a linear trend"
	case "break-stationary":
		return "stationary around structural breaks"
	case "unit-root":
		return "unit root"
	case "unit-root-breaks":
		return "unit root, with structural breaks"
	case "explosive":
		return "explosive"
	case "inconclusive":
		return "inconclusive"
	case "":
		return "no class"
	}
	return class
}

// orderText is "I(d)" or "order undetermined".
func orderText(o *int) string {
	if o == nil {
		return "order undetermined"
	}
	return "I(" + strconv.Itoa(*o) + ")"
}

// transformWords puts a recommended transform in words.
func transformWords(t string) string {
	switch t {
	case "", "none":
		return "none (use levels)"
	case "detrend":
		return "remove a linear trend"
	case "shift-dummies":
		return "add shift dummies at the breaks"
	case "difference":
		return "first difference"
	case "log-difference":
		return "difference of logs"
	case "second-difference":
		return "second difference"
	case "seasonal-difference":
		return "seasonal difference"
	}
	return t
}

// verdictHeadline is the one-line verdict: class, order, drift, transform.
func verdictHeadline(v *schema.Verdict) string {
	s := classWords(v.Class) + ", " + orderText(v.Order)
	if v.Drift {
		s += ", with drift"
	}
	return s + "; recommended transform: " + transformWords(v.Transform)
}

// windowText describes the suspected-window check.
func windowText(w *schema.WindowCheck) string {
	if w.Answer != "" {
		// The verdict's own answer names the restricted test, its
		// simulated p-value and the dates.
		return visible(w.Answer)
	}
	s := "suspected window " + w.From + ".." + w.To + ": "
	if w.BreakInside {
		s += "the break-aware test restricted to it rejects a unit root"
	} else {
		s += "the break-aware test restricted to it does not reject a unit root"
	}
	if w.Known != nil && w.Known.Statistic != nil {
		s += "; known-break test " + w.Known.Test + " " + num(*w.Known.Statistic, "n/a") +
			" (" + resultDecision(w.Known) + ")"
	}
	if w.Test != nil {
		s += "; " + windowTestText(w.Test)
	}
	return s
}

// seriesMeta is the header of a series: n, sample, frequency, transform.
func seriesMeta(s *schema.Series) string {
	parts := []string{"n=" + strconv.Itoa(s.N)}
	if s.Start != "" || s.End != "" {
		parts = append(parts, s.Start+".."+s.End)
	}
	if s.Frequency != "" {
		parts = append(parts, s.Frequency)
	}
	t := s.Transform
	if t == "" {
		t = "levels"
	}
	parts = append(parts, "transform: "+t)
	return strings.Join(parts, ", ")
}

// settingsNotes summarises the settings that shape every number: trend, lag
// rule, maximum lags, trimming, level, shift and simulation.
func settingsNotes(s *schema.Settings) []string {
	trend := s.Trend
	if trend == "" || trend == "auto" {
		trend = "chosen per test (auto)"
	}
	lag := "each method's rule (BIC for ADF and py, MAIC for DF-GLS and the M-tests, t-sig for the other break tests, 0 for sadf/gsadf)"
	if s.Lags != nil {
		lag = "fixed at " + strconv.Itoa(*s.Lags)
	} else if s.LagRule != "" {
		lag = s.LagRule
	}
	maxl := "Schwert (1989), floor(12 (T/100)^(1/4)); 8 for break tests"
	if s.MaxLags != nil {
		maxl = strconv.Itoa(*s.MaxLags)
	}
	trim := 0.15
	if s.Trim > 0 && finite(s.Trim) {
		trim = s.Trim
	}
	level := 0.05
	if s.Level > 0 && finite(s.Level) {
		level = s.Level
	}
	shift := s.Shift
	if shift == "" {
		shift = "level (the verdict's own stages run both level and level+slope searches)"
	}
	sims := "none"
	if s.Sims > 0 {
		sims = strconv.Itoa(s.Sims) + " replications, seed " + strconv.FormatUint(s.Seed, 10)
	}
	return []string{
		"trend: " + trend,
		"lag rule: " + lag,
		"max lags: " + maxl,
		"trimming: " + strconv.FormatFloat(trim, 'f', -1, 64),
		"level: " + strconv.FormatFloat(level, 'f', -1, 64),
		"break shift: " + shift,
		"simulation: " + sims,
	}
}

// sortedKeys returns the keys of m in natural order: runs of digits
// compare as numbers, so gamma2 comes before gamma10.
func sortedKeys(m map[string]float64) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(i, j int) bool { return naturalLess(keys[i], keys[j]) })
	return keys
}

// naturalLess compares a and b with runs of ASCII digits read as numbers
// (leading zeros ignored, then the shorter run first); ties fall back to
// the plain byte order.
func naturalLess(a, b string) bool {
	i, j := 0, 0
	for i < len(a) && j < len(b) {
		ca, cb := a[i], b[j]
		if isDigit(ca) && isDigit(cb) {
			si, sj := i, j
			for i < len(a) && isDigit(a[i]) {
				i++
			}
			for j < len(b) && isDigit(b[j]) {
				j++
			}
			da := strings.TrimLeft(a[si:i], "0")
			db := strings.TrimLeft(b[sj:j], "0")
			if len(da) != len(db) {
				return len(da) < len(db)
			}
			if da != db {
				return da < db
			}
			continue
		}
		if ca != cb {
			return ca < cb
		}
		i++
		j++
	}
	if len(a)-i != len(b)-j {
		return len(a)-i < len(b)-j
	}
	return a < b
}

func isDigit(c byte) bool { return c >= '0' && c <= '9' }

// value formats a named quantity that may be a count: an integer prints as
// an integer ("4", not "4.0000"), anything else with four decimals.
func value(x float64, na string) string {
	if finite(x) && x == math.Trunc(x) && math.Abs(x) < 1e15 {
		return strconv.FormatInt(int64(x), 10)
	}
	return num(x, na)
}

// estimatesText lists named estimates as "name=value", in natural order,
// counts as integers.
func estimatesText(m map[string]float64) string {
	keys := sortedKeys(m)
	parts := make([]string, len(keys))
	for i, k := range keys {
		parts[i] = visible(k) + "=" + value(m[k], "n/a")
	}
	return strings.Join(parts, ", ")
}

// variantMax is the longest variant label the tables print; a longer one is
// cut at its first parenthesis or comma and the rest goes to the notes.
const variantMax = 24

// shortVariant splits a variant label into the short form the result tables
// print and the details (parameters, options) that go to the notes under
// the row: "statistic = UDmax (q=1, pure structural change, trimming 0.15,
// M=5)" becomes "UDmax" with the details "q=1, pure structural change,
// trimming 0.15, M=5". A short label is returned whole.
func shortVariant(v string) (short, detail string) {
	v = strings.TrimSpace(visible(v))
	if len([]rune(v)) <= variantMax {
		return v, ""
	}
	head := v
	if i := strings.Index(head, " = "); i >= 0 && i < 20 {
		head = strings.TrimSpace(head[i+3:]) // "statistic = UDmax": the name is enough
	}
	if i := strings.Index(head, " ("); i > 0 {
		detail = strings.TrimSuffix(strings.TrimSpace(head[i+2:]), ")")
		head = strings.TrimSpace(head[:i])
	}
	if len([]rune(head)) > variantMax {
		parts := strings.Split(head, ", ")
		n := 1
		for l := len([]rune(parts[0])); n < len(parts) && l+2+len([]rune(parts[n])) <= variantMax; n++ {
			l += 2 + len([]rune(parts[n]))
		}
		rest := strings.Join(parts[n:], ", ")
		head = strings.Join(parts[:n], ", ")
		if detail != "" && rest != "" {
			detail = rest + "; " + detail
		} else if rest != "" {
			detail = rest
		}
	}
	return head, detail
}

// variantText is the short variant of r with its break shift appended
// ("model A level"), and the details of the variant for the notes.
func variantText(r *schema.Result) (short, detail string) {
	short, detail = shortVariant(r.Variant)
	if r.Shift != "" {
		short = strings.TrimSpace(short + " " + visible(r.Shift))
	}
	return short, detail
}

// variantTrendText is variantText with the deterministic terms in front for
// tests without a break shift, for the tables that have no trend column
// (text and Markdown): two ADF rows on the same series then read
// "constant, ..." and "trend, ..." instead of looking like one test twice.
func variantTrendText(r *schema.Result) (short, detail string) {
	short, detail = variantText(r)
	if r.Shift != "" {
		return short, detail
	}
	var w string
	switch r.Trend {
	case "constant":
		w = "constant"
	case "linear":
		w = "trend"
	case "none":
		w = "no constant"
	default:
		return short, detail
	}
	if short == "" {
		return w, detail
	}
	return w + ", " + short, detail
}

// surfaceText summarises a two-break surface.
func surfaceText(s *schema.Surface) string {
	return strconv.Itoa(s.Candidates) + " candidate pairs, statistic from " +
		num(s.Min, "n/a") + " to " + num(s.Max, "n/a")
}

// wrap splits text into lines of at most width runes (longer words stay whole).
func wrap(text string, width int) []string {
	words := strings.Fields(text)
	var lines []string
	var cur strings.Builder
	n := 0
	for _, w := range words {
		wl := len([]rune(w))
		if n > 0 && n+1+wl > width {
			lines = append(lines, cur.String())
			cur.Reset()
			n = 0
		}
		if n > 0 {
			cur.WriteByte(' ')
			n++
		}
		cur.WriteString(w)
		n += wl
	}
	if n > 0 {
		lines = append(lines, cur.String())
	}
	return lines
}

// stars returns "***", "**", "*" or "" for r's significance at 1/5/10%.
func stars(p *float64, psim *float64, stat *float64, cvs map[string]float64, tail string) string {
	pv := p
	if pv == nil || !finite(*pv) {
		pv = psim
	}
	if pv != nil && finite(*pv) {
		switch {
		case *pv < 0.01:
			return "***"
		case *pv < 0.05:
			return "**"
		case *pv < 0.10:
			return "*"
		}
		return ""
	}
	if stat == nil || !finite(*stat) {
		return ""
	}
	beyond := func(key string) bool {
		c, ok := cv(cvs, key)
		if !ok {
			return false
		}
		if tail == "right" {
			return *stat > c
		}
		return *stat < c
	}
	switch {
	case beyond("0.01"):
		return "***"
	case beyond("0.05"):
		return "**"
	case beyond("0.10"):
		return "*"
	}
	return ""
}
