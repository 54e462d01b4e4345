package numfmt_test

import (
	"fmt"

	"github.com/chanlint/chanlint/model/numfmt"
)

// A finding's message holds the measured value beside its limit, and its
// remedy the amount needed, rounded up to a buildable increment.
func Example() {
	depth, limit := 0.18, 0.3
	a, b := numfmt.Pair(depth, limit)
	fmt.Printf("freeboard %s m is below %s m\n", a, b)
	fmt.Printf("raise the bank by %s m\n", numfmt.UpTo(limit-depth, 0.01))
	fmt.Println(numfmt.Num(0.993), numfmt.Num(1234.56), numfmt.Num(0.0000004))
	fmt.Println(numfmt.Up(0.0813196), numfmt.Fixed(0.00004, 3), numfmt.Span(120, 180))
	// Output:
	// freeboard 0.18 m is below 0.30 m
	// raise the bank by 0.12 m
	// 0.993 1235 4e-7
	// 0.0814 0.00004 120–180
}
