// Fuzz test of the procedure's entry point: any series either gives an
// outcome whose verdict (when there is one) has a class from the documented
// set and finite numbers, or an error; never a panic.
package decide

import (
	"context"
	"encoding/binary"
	"math"
	"slices"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

func FuzzRun(f *testing.F) {
	seed := func(v ...float64) []byte {
		b := make([]byte, 8*len(v))
		for i, x := range v {
			binary.LittleEndian.PutUint64(b[8*i:], math.Float64bits(x))
		}
		return b
	}
	f.Add(seed(1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 20, 21, 22, 23, 24, 25), "")
	f.Add(seed(1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1), "3:9")
	f.Add(seed(0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1), "9:3")
	f.Add(seed(1e300, -1e300, 5, 1e-300, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19, 20), "")
	classes := []string{ClassStationary, ClassTrendStationary, ClassBreakStationary, ClassUnitRoot, ClassUnitRootBreaks, ClassExplosive, ClassInconclusive}
	f.Fuzz(func(t *testing.T, data []byte, window string) {
		n := len(data) / 8
		if n > 400 {
			n = 400
		}
		y := make([]float64, n)
		for i := range y {
			y[i] = math.Float64frombits(binary.LittleEndian.Uint64(data[8*i:]))
			if math.IsNaN(y[i]) || math.IsInf(y[i], 0) {
				y[i] = float64(i)
			}
		}
		out, err := Run(context.Background(), Input{Y: y, Settings: schema.Settings{Window: window}})
		if err != nil {
			return
		}
		if v := out.Verdict; v != nil && !slices.Contains(classes, v.Class) {
			t.Fatalf("class %q", v.Class)
		}
	})
}
