package report_test

import (
	"fmt"
	"os"

	"github.com/rootshift/rootshift/breaks/report"
	"github.com/rootshift/rootshift/core/schema"
)

func ExampleACF() {
	r := report.ACF([]float64{1, 2, 3, 4, 5}, 2)
	fmt.Printf("%.4f %.4f %.4f\n", r[0], r[1], r[2])
	// Output: 1.0000 0.4000 -0.1000
}

func ExampleWrite() {
	stat, p := -3.9876, 0.0123
	doc := &schema.Document{
		Schema: schema.ID, Version: "0.1.0",
		Series: []schema.Series{{
			Name: "rate", N: 120,
			Results: []schema.Result{{
				Test: "adf", Trend: "constant", Statistic: &stat, PValue: &p, Tail: "left", Lags: 2,
				CriticalValues: map[string]float64{"0.05": -2.8859}, NObs: 117, Null: "unit root",
				Reject: true, Level: 0.05,
			}},
			Errors: []schema.Error{},
		}},
		Caution: schema.Caution,
	}
	if err := report.Write(os.Stdout, "csv", doc, nil); err != nil {
		fmt.Println(err)
	}
	// Output:
	// row_type,id,series,test,variant,component,trend,shift,statistic,p_value,p_value_bound,p_value_sim,cv_1,cv_5,cv_10,tail,lags,lag_rule,nobs,level,reject,decision,break_dates,break_indexes,verdict_class,verdict_order,verdict_transform,message
	// result,rate,rate,adf,,,constant,,-3.9876,0.0123,,,,-2.8859,,left,2,,117,0.05,true,rejects unit root,,,,,,
}
