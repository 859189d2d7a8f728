package dataset

import (
	"errors"
	"fmt"
)

// Sentinel errors wrapped by *ParseError and *SeriesError.
var (
	ErrNoHeader        = errors.New("no header row")
	ErrNoSeries        = errors.New("no numeric series")
	ErrBadNumber       = errors.New("not a number")
	ErrBadDate         = errors.New("not a date")
	ErrAmbiguousDate   = errors.New("ambiguous dates")
	ErrGap             = errors.New("calendar gap")
	ErrExtraCells      = errors.New("more cells than the header")
	ErrEncoding        = errors.New("unsupported text encoding")
	ErrQuote           = errors.New("unbalanced quote")
	ErrDateOrder       = errors.New("dates are not increasing")
	ErrUnknownColumn   = errors.New("unknown column")
	ErrNotContiguous   = errors.New("rows of one id are not contiguous")
	ErrTooShort        = errors.New("too few observations")
	ErrInteriorMissing = errors.New("missing value inside the sample")
	ErrNonPositive     = errors.New("log of a value that is not positive")
	ErrBadRange        = errors.New("bad sample range")
	ErrBadTransform    = errors.New("unknown transform")
)

// ParseError is a problem at a position in an input file, like
// encoding/csv.ParseError. Row is the 1-based physical line in the file (the
// sheet row for .xlsx), Column the 1-based column; either is 0 when unknown.
type ParseError struct {
	File       string
	Row        int
	Column     int
	ColumnName string
	// Value is the offending cell text, if any.
	Value string
	// ID is the series id of a long or JSON Lines record, if known.
	ID  string
	Err error
}

func (e *ParseError) Error() string {
	s := ""
	if e.File != "" {
		s = e.File + ": "
	}
	if e.ID != "" {
		s += fmt.Sprintf("id %q: ", e.ID)
	}
	if e.Row > 0 {
		s += fmt.Sprintf("line %d: ", e.Row)
	}
	if e.Column > 0 {
		if e.ColumnName != "" {
			s += fmt.Sprintf("column %d (%q): ", e.Column, e.ColumnName)
		} else {
			s += fmt.Sprintf("column %d: ", e.Column)
		}
	} else if e.ColumnName != "" {
		s += fmt.Sprintf("column %q: ", e.ColumnName)
	}
	if e.Value != "" {
		return s + fmt.Sprintf("%v: %q", e.Err, e.Value)
	}
	return s + e.Err.Error()
}

func (e *ParseError) Unwrap() error { return e.Err }

// SeriesError is a problem with one series found by Select or Transform; both
// SeriesError and *SeriesError implement error.
// Series is "" when the problem concerns every series (a bad sample range).
// Row is the 1-based observation (data row of the table, or index into the
// slice passed to Transform), 0 when not tied to one; Date is its label when
// the table has dates.
type SeriesError struct {
	Series string
	Row    int
	Date   string
	Err    error
}

func (e SeriesError) Error() string {
	s := ""
	if e.Series != "" {
		s = fmt.Sprintf("series %q: ", e.Series)
	}
	if e.Row > 0 {
		if e.Date != "" {
			s += fmt.Sprintf("observation %d (%s): ", e.Row, e.Date)
		} else {
			s += fmt.Sprintf("observation %d: ", e.Row)
		}
	}
	return s + e.Err.Error()
}

func (e SeriesError) Unwrap() error { return e.Err }

func wrapf(sentinel error, format string, args ...any) error {
	return fmt.Errorf("%w: %s", sentinel, fmt.Sprintf(format, args...))
}
