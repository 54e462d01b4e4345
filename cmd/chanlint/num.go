package main

import (
	"math"
	"strconv"
)

// jsonDecimals is the number of decimals every computed number keeps in
// JSON and CSV output: 0.1 mm in SI and 0.001 in in US units, well below
// the 3 mm closure of the standard-step method, and short enough to read.
const jsonDecimals = 4

// round returns x rounded to d decimals, with -0 turned into 0. Values too
// large to scale are returned as they are.
func round(x float64, d int) float64 {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return 0
	}
	if math.Abs(x) >= 1e15 {
		return x
	}
	p := math.Pow10(d)
	r := math.Round(x*p) / p
	if r == 0 {
		return 0
	}
	return r
}

// finite returns a pointer to x rounded for JSON, or nil (JSON null) when x
// is not finite, so that no output ever carries NaN or Inf.
func finite(x float64) *float64 {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return nil
	}
	r := round(x, jsonDecimals)
	return &r
}

// formatNumber prints x with at most d decimals and no trailing zeros
// ("120", "0.18", "3.25"); a value that is not finite prints as "n/a".
func formatNumber(x float64, d int) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return "n/a"
	}
	return strconv.FormatFloat(round(x, d), 'f', -1, 64)
}

// fixed prints x with exactly d decimals, for aligned table columns; a
// value that is not finite prints as "n/a".
func fixed(x float64, d int) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return "n/a"
	}
	return strconv.FormatFloat(round(x, d), 'f', d, 64)
}
