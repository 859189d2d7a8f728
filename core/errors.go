package core

import (
	"errors"
	"fmt"
)

// Sentinel errors. Errors returned by this package wrap one of these in an
// *Error carrying the test id and, where relevant, the observation.
var (
	ErrTooShort   = errors.New("series too short")
	ErrNonFinite  = errors.New("non-finite value (NaN or Inf)")
	ErrSingular   = errors.New("singular or collinear design")
	ErrConstant   = errors.New("series is constant")
	ErrSettings   = errors.New("invalid settings")
	ErrUnknown    = errors.New("unknown test id")
	ErrCancelled  = errors.New("cancelled")
	ErrNoEstimate = errors.New("statistic could not be computed")
)

// Error is the error type of every test entry point: the test id, the
// observation (1-based, 0 when not tied to one) and the underlying cause.
type Error struct {
	Test  string
	Index int
	Err   error
}

func (e *Error) Error() string {
	if e.Index > 0 {
		return fmt.Sprintf("%s: observation %d: %v", e.Test, e.Index, e.Err)
	}
	if e.Test == "" {
		return e.Err.Error()
	}
	return fmt.Sprintf("%s: %v", e.Test, e.Err)
}

func (e *Error) Unwrap() error { return e.Err }

// Errorf returns an *Error for test with a formatted cause wrapping sentinel.
func Errorf(test string, sentinel error, format string, args ...any) error {
	return &Error{Test: test, Err: fmt.Errorf("%w: %s", sentinel, fmt.Sprintf(format, args...))}
}

// CheckFinite returns an *Error naming the first non-finite observation.
func CheckFinite(test string, y []float64) error {
	for i, v := range y {
		if v != v || v > maxFloat || v < -maxFloat {
			return &Error{Test: test, Index: i + 1, Err: ErrNonFinite}
		}
	}
	return nil
}

const maxFloat = 1.7976931348623157e308

// ErrExplosiveFit is wrapped by the explosive-root tests when a window
// regression fits exactly with an explosive coefficient: the series is, up
// to rounding, a deterministic explosive path. It reads as ErrNoEstimate
// (errors.Is(err, ErrNoEstimate) is true) and lets a caller tell this case,
// which is evidence of an explosive root, from other failures.
var ErrExplosiveFit error = explosiveFit{}

type explosiveFit struct{}

func (explosiveFit) Error() string { return ErrNoEstimate.Error() }
func (explosiveFit) Unwrap() error { return ErrNoEstimate }
