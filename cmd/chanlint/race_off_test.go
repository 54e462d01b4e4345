//go:build !race

package main

// raceEnabled says whether the tests run under the race detector.
const raceEnabled = false
