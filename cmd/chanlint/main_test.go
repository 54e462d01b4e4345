package main

import (
	"os"
	"testing"
)

// cliEnv, set to 1 in its environment, makes the package's test binary
// run as chanlint itself (see TestMain).
const cliEnv = "CHANLINT_TEST_AS_CLI"

// TestMain lets the test binary, which go test builds once per package
// run, stand in for the chanlint binary: started with cliEnv=1 it runs
// main with its arguments. Tests that need a real process (exit codes,
// GOMAXPROCS, a clean environment) run it through cliBinary instead of
// building a binary of their own.
func TestMain(m *testing.M) {
	if os.Getenv(cliEnv) == "1" {
		main()
		return // main exits
	}
	os.Exit(m.Run())
}

// cliBinary is the path of a chanlint binary for subprocesses: this test
// binary, with cliEnv set for the test's duration so that the processes it
// starts with os.Environ() run as chanlint.
func cliBinary(t testing.TB) string {
	t.Helper()
	bin, err := os.Executable()
	if err != nil {
		t.Fatalf("cannot locate the test binary: %v", err)
	}
	t.Setenv(cliEnv, "1")
	return bin
}
