package main

import (
	"os"
	"testing"

	"github.com/rogpeppe/go-internal/testscript"
)

// The command line is tested as a user types it: each file in
// testdata/script runs lyacert and compares its output and exit code.
func TestMain(m *testing.M) {
	testscript.Main(m, map[string]func(){
		"lyacert": func() { os.Exit(run(os.Args[1:], &env{os.Stdin, os.Stdout, os.Stderr})) },
	})
}

func TestScripts(t *testing.T) {
	testscript.Run(t, testscript.Params{
		Dir:                 "testdata/script",
		RequireExplicitExec: true,
		Setup: func(e *testscript.Env) error {
			// Models shared with the other packages' tests.
			e.Setenv("MODELS", mustAbs("../../testdata/models"))
			// The demo models, as files.
			e.Setenv("EXAMPLES", mustAbs("../../examples"))
			return nil
		},
	})
}

func mustAbs(p string) string {
	wd, err := os.Getwd()
	if err != nil {
		panic(err)
	}
	return wd + "/" + p
}
