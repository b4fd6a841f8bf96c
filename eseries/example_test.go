package eseries_test

import (
	"fmt"

	"tonewright/eseries"
)

func ExampleParse() {
	for _, s := range []string{"4700", "4.7k", "4k7", "4.7kΩ", "2n2", "100nF", "R47", "1meg", "4x7"} {
		v, err := eseries.Parse(s)
		if err != nil {
			fmt.Println(err)
			continue
		}
		fmt.Printf("%-6s %g\n", s, v)
	}
	// Output:
	// 4700   4700
	// 4.7k   4700
	// 4k7    4700
	// 4.7kΩ  4700
	// 2n2    2.2e-09
	// 100nF  1e-07
	// R47    0.47
	// 1meg   1e+06
	// bad value "4x7": unexpected "x7" after "4"; use a number with an optional SI prefix and unit (4700, 4.7e3, 4.7k, 100n, 2.2uF, 1M, 10mH, 4.7kΩ) or an RKM code (4k7, 2n2, R47, 1M0, 100R)
}

func ExampleFormat() {
	for _, v := range []float64{4700, 2.2e-9, 470e-12, 1e6, 0.47, 12345.678} {
		fmt.Println(eseries.Format(v))
	}
	fmt.Println(eseries.FormatSig(999.96, 3))
	// Output:
	// 4.7k
	// 2.2n
	// 470p
	// 1M
	// 470m
	// 12.3457k
	// 1k
}

func ExampleSnapTo() {
	// A calculation asked for 5.3k; which E24 resistors are nearby?
	s, err := eseries.SnapTo(eseries.E24, 5300)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("below   %s (%+.1f%%)\n", eseries.Format(s.Below), 100*s.BelowErr)
	fmt.Printf("above   %s (%+.1f%%)\n", eseries.Format(s.Above), 100*s.AboveErr)
	fmt.Printf("nearest %s\n", eseries.Format(s.Nearest))
	// Output:
	// below   5.1k (-3.8%)
	// above   5.6k (+5.7%)
	// nearest 5.1k
}

func ExampleRange() {
	// Capacitors on hand: E6 values from 1n to 100n.
	caps := eseries.Range(eseries.E6, 1e-9, 100e-9)
	fmt.Println(caps)
	for v, ok := caps.Above(0); ok; v, ok = eseries.Next(caps, v) {
		fmt.Print(eseries.Format(v), " ")
	}
	fmt.Println()
	// Output:
	// E6 in 1n..100n
	// 1n 1.5n 2.2n 3.3n 4.7n 6.8n 10n 15n 22n 33n 47n 68n 100n
}

func ExampleNewList() {
	stock, err := eseries.NewList([]float64{10e3, 4.7e3, 22e3, 4.7e3, 47e3})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(stock)
	v, _ := eseries.Nearest(stock, 15e3)
	fmt.Println(eseries.Format(v))
	// Output:
	// stock list (4 values)
	// 22k
}

func ExampleSeriesByName() {
	s, err := eseries.SeriesByName("e12")
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(s, len(s.Mantissas), s.Tolerance)
	_, err = eseries.SeriesByName("E25")
	fmt.Println(err)
	// Output:
	// E12 12 0.1
	// unknown series "E25": use one of E3, E6, E12, E24, E48, E96, E192
}
