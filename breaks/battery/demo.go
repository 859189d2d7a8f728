package battery

import (
	"bytes"
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
)

// DemoName is the file name under which the demo data is presented.
const DemoName = "vellmark-demo.csv"

// DemoDescription says what the demo data is. The scenario is invented.
const DemoDescription = "Invented demo data: monthly indicators (2000-01 to 2019-12) of Vellmark, a fictional " +
	"region. Every series is simulated by rootshift's seeded demo generator; none is real data. " +
	"freight_volume is a random walk; consumer_prices a random walk with drift (in levels, positive); " +
	"power_demand is stationary around a linear trend; jobless_rate is stationary around a level shift that starts " +
	"in 2009-03 (an invented crisis; the break date, the last month of the old regime, is 2009-02); " +
	"credit_spread is stationary; housing_index grows explosively " +
	"from 2004-07 to 2007-06 and then collapses; visitor_nights is a random walk whose drift turns from growth to " +
	"decline after 2009-02."

// DemoSeed seeds the demo generator.
const DemoSeed = 20091

// demoStreams selects, per series, the random stream of its draw. The draws
// were chosen to be typical of the process each series is generated from
// (a demo should show each case); how often the verdict gets each process
// right over many draws is measured separately (see README, "The verdict").
var demoStreams = [7]uint64{10, 1, 12, 3, 4, 5, 6}

// DemoCSV returns the demo data as CSV: a date column and seven series,
// generated reproducibly from DemoSeed (the same bytes on every platform).
func DemoCSV() []byte {
	const T = 240
	// Each series draws from its own stream, so changing one leaves the
	// others as they are.
	var r *rand.Rand
	e := func() float64 { return r.NormFloat64() }
	stream := func(j int) { r = rand.New(rand.NewPCG(DemoSeed, demoStreams[j])) }
	cols := []string{"freight_volume", "consumer_prices", "power_demand", "jobless_rate", "credit_spread", "housing_index", "visitor_nights"}
	data := make([][]float64, len(cols))
	for j := range data {
		data[j] = make([]float64, T)
	}
	crisis := 110 // 2009-03 is observation 111; TB = 110 is the last pre-crisis month (2009-02)
	stream(0)
	// freight_volume: driftless random walk.
	y := 500.0
	for t := 0; t < T; t++ {
		y += 4 * e()
		data[0][t] = y
	}
	stream(1)
	// consumer_prices: random walk with drift in logs.
	ly := math.Log(100)
	for t := 0; t < T; t++ {
		ly += 0.002 + 0.003*e()
		data[1][t] = math.Exp(ly)
	}
	stream(2)
	// power_demand: trend-stationary AR(1), phi = 0.5.
	u := 0.0
	for t := 0; t < T; t++ {
		u = 0.5*u + 3*e()
		data[2][t] = 1200 + 1.5*float64(t+1) + u
	}
	stream(3)
	// jobless_rate: AR(1), phi = 0.6, around a level shift of +2.5 points.
	u = 0
	for t := 0; t < T; t++ {
		u = 0.6*u + 0.25*e()
		lvl := 5.0
		if t >= crisis {
			lvl = 7.5
		}
		data[3][t] = lvl + u
	}
	stream(4)
	// credit_spread: stationary AR(1), phi = 0.7.
	u = 0
	for t := 0; t < T; t++ {
		u = 0.7*u + 0.1*e()
		data[4][t] = 1.8 + u
	}
	stream(5)
	// housing_index: random walk, explosive (root 1.03) from 2004-07 to
	// 2007-06 (observations 55..90), collapse over 12 months, random walk after.
	h := 100.0
	var peak float64
	for t := 0; t < T; t++ {
		switch {
		case t >= 54 && t < 90:
			h = 1.03*h + e()
			peak = h
		case t >= 90 && t < 102:
			h -= (peak - 110) / 12
			h += e()
		default:
			h += e()
		}
		data[5][t] = h
	}
	stream(6)
	// visitor_nights: random walk whose drift turns from growth (+3 a month)
	// to decline (-3 a month) after the crisis.
	y = 900
	for t := 0; t < T; t++ {
		d := 3.0
		if t >= crisis {
			d = -3
		}
		y += d + 6*e()
		data[6][t] = y
	}
	var b bytes.Buffer
	b.WriteString("month")
	for _, c := range cols {
		b.WriteString("," + c)
	}
	b.WriteString("\n")
	for t := 0; t < T; t++ {
		fmt.Fprintf(&b, "%04d-%02d", 2000+t/12, t%12+1)
		for j := range cols {
			b.WriteString(",")
			b.WriteString(strconv.FormatFloat(data[j][t], 'f', 4, 64))
		}
		b.WriteString("\n")
	}
	return b.Bytes()
}
