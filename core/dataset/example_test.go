package dataset_test

import (
	"fmt"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

func ExampleParse() {
	data := "Periode;BIP\n2009M01;1.234,5\n2009M02;1.250,75\n2009M03;NA\n"
	t, err := dataset.Parse("pasted", []byte(data), nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(t.DateColumn, t.Frequency, t.Dates, t.DecimalComma)
	fmt.Println(t.Series[0].Name, t.Series[0].Values)
	// Output:
	// Periode monthly [2009-01 2009-02 2009-03] true
	// BIP [1234.5 1250.75 NaN]
}

func ExampleSelect() {
	t, _ := dataset.Parse("pasted", []byte("quarter,gdp\n2000Q1,100\n2000Q2,102\n2000Q3,105\n2000Q4,109\n"), nil)
	series, errs := dataset.Select(t, schema.Settings{From: "2000Q2", Transform: "diff"})
	fmt.Println(series[0].Dates, series[0].Values, len(errs))
	// Output:
	// [2000Q3 2000Q4] [3 4] 0
}
