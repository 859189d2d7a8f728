package breaks_test

import (
	"context"
	"fmt"
	"math/rand/v2"

	_ "github.com/rootshift/rootshift/breaks"
	"github.com/rootshift/rootshift/core"
)

// The za test on a stationary AR(1) around a level shift after observation
// 60: the break date is found and the unit root rejected.
func Example_za() {
	r := rand.New(rand.NewPCG(1, 2))
	y := make([]float64, 120)
	u := 0.0
	for t := range y {
		u = 0.5*u + r.NormFloat64()
		y[t] = u
		if t+1 > 60 {
			y[t] += 5
		}
	}
	info, _ := core.Lookup("za")
	res, err := info.Run(context.Background(), y, &core.Config{LagRule: core.LagFixed, Lags: 0, NoPath: true})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("t = %.4f, break after observation %d, 5%% critical value %.2f\n",
		*res.Statistic, res.Breaks[0].Index, res.CriticalValues["0.05"])
	// Output:
	// t = -9.2182, break after observation 60, 5% critical value -4.80
}
