package decide

import (
	"context"
	"fmt"
	"math/rand/v2"

	"github.com/rootshift/rootshift/core"
)

// bootstrapP returns the bootstrap p-value of an upper-tail statistic:
// (1 + #{S*_b >= obs}) / (1 + B_valid), over B draws from the fitted null m,
// with draw b seeded by rand.NewPCG(seed, b). Draws on which stat fails
// (an exact fit, a singular design) are left out and counted in failed; if
// more than a tenth fail, the p-value is not trusted and an error returned.
func bootstrapP(ctx context.Context, m *nullModel, T, B int, seed uint64, obs float64, stat func([]float64) (float64, error)) (p float64, failed int, err error) {
	y := make([]float64, T)
	u := make([]float64, T)
	exceed, valid := 0, 0
	for b := range B {
		if b%16 == 0 && ctx.Err() != nil {
			return 0, failed, fmt.Errorf("%w: %v", core.ErrCancelled, ctx.Err())
		}
		r := rand.New(rand.NewPCG(seed, uint64(b)))
		m.draw(y, u, r)
		s, e := stat(y)
		if e != nil {
			failed++
			continue
		}
		valid++
		if s >= obs {
			exceed++
		}
	}
	if failed*10 > B {
		return 0, failed, fmt.Errorf("the statistic failed on %d of %d bootstrap samples", failed, B)
	}
	return float64(1+exceed) / float64(1+valid), failed, nil
}
