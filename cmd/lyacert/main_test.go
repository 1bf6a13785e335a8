package main

import (
	"errors"
	"os"
	"os/exec"
	"strconv"
	"testing"

	"github.com/rogpeppe/go-internal/testscript"
)

// The command line is tested as a user types it: each file in
// testdata/script runs lyacert and compares its output and exit code.
func TestMain(m *testing.M) {
	testscript.Main(m, map[string]func(){
		"lyacert": func() { os.Exit(run(os.Args[1:], &env{stdin: os.Stdin, stdout: os.Stdout, stderr: os.Stderr})) },
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
		Cmds: map[string]func(ts *testscript.TestScript, neg bool, args []string){
			// exits N PROG ARGS... runs PROG as exec does and requires exit
			// status N (the exit codes are part of the interface).
			"exits": func(ts *testscript.TestScript, neg bool, args []string) {
				if neg || len(args) < 2 {
					ts.Fatalf("usage: exits N PROG [ARGS...]")
				}
				want, err := strconv.Atoi(args[0])
				if err != nil {
					ts.Fatalf("exits: %v", err)
				}
				got := 0
				if err := ts.Exec(args[1], args[2:]...); err != nil {
					var ee *exec.ExitError
					if !errors.As(err, &ee) {
						ts.Fatalf("exits: %v", err)
					}
					got = ee.ExitCode()
				}
				if got != want {
					ts.Fatalf("exit status %d, want %d", got, want)
				}
			},
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
