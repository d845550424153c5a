package discharge_test

import (
	"fmt"

	"lixiv/engine/discharge"
)

func ExampleRead() {
	// A daily record pasted from a spreadsheet in a European locale, from the
	// fictional Corrie Vale gauge.
	text := "Date;Q (m3/s)\n" +
		"29.09.2021;0,40\n" +
		"30.09.2021;0,42\n" +
		"01.10.2021;0,46\n" +
		"03.10.2021;1,30\n" +
		"02.10.2021;-1\n"
	imp := discharge.ReadString(text, discharge.Options{File: "corrie.csv"})
	for _, n := range imp.Notes {
		fmt.Println("note:", n)
	}
	for _, p := range imp.Problems {
		fmt.Println("problem:", p)
	}
	filled, rep := imp.Record.Fill(discharge.FillLinear, 3)
	fmt.Println("filled:", rep.Filled)
	for i, d := range filled.Days {
		fmt.Printf("%s %.2f m3/s\n", d, filled.Q[i])
	}
	// Output:
	// note: columns separated by semicolons
	// note: numbers read with a decimal comma
	// note: dates read day-first (line 2 has a day above 12)
	// note: discharge unit m3/s
	// note: 1 gap day in 1 gap, not filled
	// problem: corrie.csv:6 (Date): dates not in order: row 6 comes before a row above it; the table was loaded in date order
	// problem: corrie.csv:6:2 (Q (m3/s)): negative discharge: 2021-10-02: -1 is below zero; the day is left out (a gap)
	// filled: [2021-10-02 (1 day)]
	// 2021-09-29 0.40 m3/s
	// 2021-09-30 0.42 m3/s
	// 2021-10-01 0.46 m3/s
	// 2021-10-02 0.88 m3/s
	// 2021-10-03 1.30 m3/s
}

func ExampleRecord_Years() {
	// Two years of a constant 1 m3/s from 1 October 2020: two complete
	// water years starting in October, each crossing a calendar year.
	q := make([]float64, 730)
	for i := range q {
		q[i] = 1
	}
	r := discharge.NewRecord("demo", discharge.Date(2020, 10, 1), q)
	for _, y := range r.Years(10) {
		mm, _ := r.Runoff(y.Start, y.End, 100)
		fmt.Printf("water year %s: %d of %d days, runoff %.2f mm over 100 km2\n", y, y.WithData, y.Days, mm)
	}
	// Output:
	// water year 2020-10/2021-09: 365 of 365 days, runoff 315.36 mm over 100 km2
	// water year 2021-10/2022-09: 365 of 365 days, runoff 315.36 mm over 100 km2
}
