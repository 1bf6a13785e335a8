package main

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"slices"
	"strings"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/certify/boxsos"
	"github.com/lyacert/lyacert/claims"

	"github.com/alecthomas/kong"
	"github.com/willabides/kongplete"

	"github.com/lyacert/lyacert/certify"
	"github.com/lyacert/lyacert/checker"
	"github.com/lyacert/lyacert/examples"
	"github.com/lyacert/lyacert/model"
	"github.com/lyacert/lyacert/report"
)

// Exit codes: each says what happened (the README and --help list them).
const (
	exitHolds     = 0 // the claim holds for every allowed parameter value
	exitFails     = 1 // it does not, holds only on part of the range, or is undecided
	exitInput     = 2 // bad input or usage, or an input limit reached
	exitStopped   = 3 // the run stopped early (timeout, interrupt, --max-points): continue with --resume
	exitMissing   = 4 // merge: shards are missing
	exitRejected  = 5 // verify (sign, report): the certificate failed verification
	exitUntrusted = 6 // verify --trust: the mathematics passed, the signer is not trusted
)

// exitCodesText closes the top-level and per-command help.
const exitCodesText = `Exit codes:
  0  the claim holds for every allowed parameter value
  1  the claim does not hold, holds only on part of the range, or is undecided
  2  bad input or usage (an input limit reached too)
  3  stopped early (--timeout, interrupt, --max-points); continue with --resume
  4  merge: shards are missing
  5  the certificate failed verification (altered, or its mathematics is wrong)
  6  verify --trust: the mathematics passed but the signer is not trusted`

const description = `lyacert checks Lyapunov-function certificates for polynomial dynamical systems.

It computes the derivative of a candidate V along the flow exactly, completes
the squares, says for which parameter values the argument holds, and writes a
certificate that "lyacert verify" re-checks from scratch.

Examples:
  lyacert demo                                   run the built-in demo model
  lyacert check model.lya                        check the candidate V in model.lya
  lyacert check model.lya --set r=1/2 -o c.json  fix a parameter, write a certificate
  lyacert check model.lya --box a=0..2 --plot region.svg  pave a region in two parameters
  lyacert check - < model.lya                    read the model from standard input
  lyacert verify c.json                          re-check a certificate
  lyacert find model.lya --set r=20 -o c.json    find equilibria, certify one from the linearization
  lyacert sweep model.lya --grid r=0..30 --points 61 -o r.jsonl   certify over a grid
  lyacert report c.json --format html -o c.html  a report for a review or a safety case
  lyacert check model.lya --json                 machine-readable output
  lyacert help sweep                             help on one command, with examples
  source <(lyacert completion bash)              shell completion (bash, zsh, fish)

` + exitCodesText

type cli struct {
	Version kong.VersionFlag `help:"Print the version and exit."`
}

// A command is registered by its own file (in init) so that commands stay
// independent of each other; each run gets fresh flag values.
type command struct {
	name, help string
	make       func() any // returns a pointer to a kong command struct with a Run(*env) error method
}

var commands []command

func register(name, help string, make func() any) {
	commands = append(commands, command{name, help, make})
}

// helpOrder lists the commands in the order --help shows them: the main job
// first; commands not listed follow in name order.
var helpOrder = []string{"check", "verify", "demo", "find", "sweep", "merge", "report", "sign", "key"}

func orderedCommands() []command {
	rank := func(name string) int {
		if i := slices.Index(helpOrder, name); i >= 0 {
			return i
		}
		return len(helpOrder)
	}
	out := slices.Clone(commands)
	slices.SortStableFunc(out, func(a, b command) int {
		if d := rank(a.name) - rank(b.name); d != 0 {
			return d
		}
		return strings.Compare(a.name, b.name)
	})
	return out
}

type common struct {
	JSON bool `help:"Print machine-readable JSON instead of text."`
}

// env is what a command needs of the outside world.
type env struct {
	stdin          io.Reader
	stdout, stderr io.Writer
	// json is set when the command runs with --json: errors are then a
	// JSON document on standard output (report.ErrorJSON).
	json bool
}

// fail reports err and returns code: with --json as report.ErrorJSON's
// document on standard output, else as text on standard error.
//
// An error that says the run's context ended (the deadline, or an
// interrupt) is no failure of the input: fail returns exitStopped and
// prints nothing, and within says why the run stopped.
func (e *env) fail(code int, err error) int {
	if errors.Is(err, context.DeadlineExceeded) || errors.Is(err, context.Canceled) {
		return exitStopped
	}
	if e.json {
		writeJSON(e.stdout, report.ErrorJSON(err, code))
	} else {
		report.ErrorText(e.stderr, err)
	}
	return code
}

// failf is fail with a formatted message.
func (e *env) failf(code int, format string, args ...any) int {
	return e.fail(code, fmt.Errorf(format, args...))
}

// status is an exit code returned by a command as an error.
type status int

func (s status) Error() string { return fmt.Sprintf("exit status %d", int(s)) }

func main() {
	os.Exit(run(os.Args[1:], &env{stdin: os.Stdin, stdout: os.Stdout, stderr: os.Stderr}))
}

// exitCode carries an exit code out of kong's help and version handling.
type exitCode int

// wantsJSON reports whether the arguments ask for JSON; it decides the
// form of errors met before the flags are parsed.
func wantsJSON(args []string) bool {
	for _, a := range args {
		if a == "--" {
			return false
		}
		if a == "--json" || a == "--json=true" {
			return true
		}
	}
	return false
}

func run(args []string, e *env) (code int) {
	var c cli
	defer func() {
		if r := recover(); r != nil {
			if ec, ok := r.(exitCode); ok {
				code = int(ec)
				return
			}
			panic(r)
		}
	}()
	e.json = wantsJSON(args)
	opts := []kong.Option{
		kong.Name("lyacert"),
		kong.Description(description),
		kong.Vars{"version": "lyacert " + certify.Version, "limits": limitNames()},
		kong.Writers(e.stdout, e.stderr),
		kong.Exit(func(n int) { panic(exitCode(n)) }),
		kong.Bind(e),
		kong.ConfigureHelp(kong.HelpOptions{Compact: true}),
	}
	if !e.json {
		opts = append(opts, kong.UsageOnError())
	}
	for _, cmd := range orderedCommands() {
		opts = append(opts, kong.DynamicCommand(cmd.name, cmd.help, "", cmd.make()))
	}
	parser, err := kong.New(&c, opts...)
	if err != nil {
		return e.fail(exitInput, err)
	}
	// A shell asking for completions (COMP_LINE set) is answered here.
	kongplete.Complete(parser, kongplete.WithExitFunc(func(n int) { panic(exitCode(n)) }))
	ctx, err := parser.Parse(args)
	if err != nil {
		return e.fail(exitInput, err)
	}
	err = ctx.Run(e)
	var st status
	switch {
	case err == nil:
		return exitHolds
	case errors.As(err, &st):
		return int(st)
	}
	return e.fail(exitInput, err)
}

// exit turns an exit code into a command's result.
func exit(code int) error {
	if code == 0 {
		return nil
	}
	return status(code)
}

type checkCmd struct {
	common
	File   string   `arg:"" help:"Model file (.lya), or - for standard input."`
	Out    string   `short:"o" name:"out" placeholder:"CERT" help:"Write the certificate to this file (atomically)."`
	Set    []string `name:"set" placeholder:"NAME=VALUE" help:"Fix a parameter to an exact value (repeatable), e.g. --set r=1/2."`
	Sign   string   `name:"sign" placeholder:"KEY" help:"Sign the written certificate with this ed25519 private key (PEM, PKCS #8: NAME.key from lyacert key new; needs -o)."`
	SDPOut string   `name:"sdp-out" placeholder:"FILE" help:"Write the last semidefinite program solved (a sum-of-squares search) to FILE in SDPA sparse format."`
	BoxSOS bool     `name:"box-sos" help:"When the verdict is not a global holds: look for one certificate that V̇ < 0 for every parameter value in the box of closed bounded ranges, −V̇ − margin = σ₀ + Σ σᵢ·(pᵢ − loᵢ)(hiᵢ − pᵢ) with sums of squares σ; -o then writes that certificate."`
	paveFlags
	limitFlags
	timeoutFlag
	keyFlags
}

type verifyCmd struct {
	common
	Cert  string   `arg:"" placeholder:"CERT" help:"Certificate file (JSON), or - for standard input."`
	Trust []string `name:"trust" placeholder:"PUB" help:"Require a valid signature by this public key (PEM SubjectPublicKeyInfo: NAME.pub.pem from lyacert key new; repeatable: any of them)."`
	limitFlags
	timeoutFlag
}

type demoCmd struct {
	common
	Out    string `short:"o" name:"out" placeholder:"CERT" help:"Write the demo's certificate to this file."`
	Report string `name:"report" placeholder:"DIR" help:"Also write the demo's certificate and its report in every format (md, tex, html) into DIR."`
	limitFlags
	timeoutFlag
}

func init() {
	register("check", "Check the candidate V of a model file.", func() any { return &checkCmd{} })
	register("verify", "Re-check a certificate file from scratch with exact arithmetic.", func() any { return &verifyCmd{} })
	register("demo", "Check the built-in demo model (an invented test-rig coolant loop); exits 0 when it ran, the verdict is in the output.", func() any { return &demoCmd{} })
}

// Run checks a model file.
func (c *checkCmd) Run(e *env) error { return exit(c.run(e)) }

// Run re-checks a certificate.
func (c *verifyCmd) Run(e *env) error { return exit(c.run(e)) }

// Run checks the demo model.
func (c *demoCmd) Run(e *env) error { return exit(c.run(e)) }

func (c *checkCmd) run(e *env) int {
	if !c.limitFlags.apply(e) {
		return exitInput
	}
	name, src, err := readInput(c.File, e.stdin)
	if err != nil {
		return e.fail(exitInput, err)
	}
	var settings []model.Setting
	for _, s := range c.Set {
		st, err := model.ParseSetting(s)
		if err != nil {
			return e.fail(exitInput, err)
		}
		settings = append(settings, st)
	}
	key, code := loadSigningKey(c.Sign, c.Out, c.keyFlags, e)
	if code != 0 {
		return code
	}
	c.sdpOut, c.boxSOS = c.SDPOut, c.BoxSOS
	ctx, cancel := c.timeoutFlag.budget()
	defer cancel()
	code = within(ctx, e, func(ctx context.Context, e *env) int {
		return checkModel(ctx, name, src, settings, c.Out, c.JSON, e, &c.paveFlags)
	})
	if code == exitStopped {
		return code
	}
	return signWritten(c.Out, key, code, c.JSON, e)
}

// run exits 0 when the demo ran to its verdict, whatever the verdict (it is
// in the output; the demo's own is "holds on part of the range"), so that a
// first run does not look like a failure. Errors keep their codes: a bad
// input, and a certificate the checker does not accept (1).
func (c *demoCmd) run(e *env) int {
	if !c.limitFlags.apply(e) {
		return exitInput
	}
	ctx, cancel := c.timeoutFlag.budget()
	defer cancel()
	var ran bool
	code := within(ctx, e, func(ctx context.Context, e *env) int {
		code, r := runCheck(ctx, examples.CoolantName, examples.Coolant, nil, c.Out, c.JSON, e, nil)
		ran = r
		return code
	})
	if code == exitStopped {
		return code
	}
	if ran {
		code = exitHolds
	}
	if c.Report != "" && code != exitInput {
		if err := writeDemoReports(c.Report, e); err != nil {
			return e.failf(exitInput, "writing the demo's reports: %w", err)
		}
	}
	return code
}

// checkModel checks a model; pf, when not nil, carries the paving flags.
func checkModel(ctx context.Context, name string, src []byte, settings []model.Setting, out string, asJSON bool, e *env, pf *paveFlags) int {
	code, _ := runCheck(ctx, name, src, settings, out, asJSON, e, pf)
	return code
}

// runCheck is checkModel; ran reports that the check reached its verdict
// and wrote it out (the exit code then says which verdict).
func runCheck(ctx context.Context, name string, src []byte, settings []model.Setting, out string, asJSON bool, e *env, pf *paveFlags) (code int, ran bool) {
	m, err := model.Parse(name, src, settings...)
	if err != nil {
		return e.fail(exitInput, err), false
	}
	res, err := pf.check(ctx, m, name, e)
	if err != nil {
		if errors.Is(err, certify.ErrUnverified) {
			return e.fail(exitRejected, err), false
		}
		return e.fail(exitInput, err), false // a stopped run gives exitStopped
	}
	if pf != nil && pf.sdpOut != "" {
		if code := writeSDPOut(pf.sdpOut, res.SDP, e); code != 0 {
			return code, false
		}
	}
	// --box-sos: one certificate for the whole box, in place of the direct
	// method's, when that does not hold everywhere.
	var box *report.BoxSOSOutput
	doc := res.Doc
	if pf != nil && pf.boxSOS && (res.Verdict != checker.VerdictHolds || res.Claim != checker.KindGlobal) {
		box = &report.BoxSOSOutput{}
		bm, err := boxsos.Find(ctx, m)
		if err == nil {
			bd, err2 := boxsos.Certify(res.Doc, bm)
			err = err2
			if err == nil {
				if v := checker.VerifyContext(ctx, bd); v.Valid && v.Verdict == checker.VerdictHolds && (res.Verdict != checker.VerdictHolds || v.Kind == checker.KindGlobal) {
					box.Holds, box.Claim, box.Digest, box.Checks, doc = true, v.Kind, bd.Digest, len(v.Records), bd
				} else {
					err = errors.New("the checker does not accept the box certificate")
				}
			}
		}
		if err != nil {
			if ctx.Err() != nil {
				return exitStopped, false
			}
			box.Reason = err.Error()
		}
	}
	written := ""
	if out != "" {
		if err := certificates.WriteFile(doc, out); err != nil {
			return e.failf(exitInput, "writing the certificate: %w", err), false
		}
		written = out
	}
	if asJSON {
		cj := report.CheckJSON(res, written)
		cj.BoxSOS = box
		writeJSON(e.stdout, cj)
	} else {
		report.CheckText(e.stdout, res, written)
		if box != nil {
			report.BoxSOSText(e.stdout, box, written)
		}
	}
	if code := pf.finish(res, e); code != 0 {
		return code, false
	}
	if res.Verdict == checker.VerdictHolds || box != nil && box.Holds {
		return exitHolds, true
	}
	return exitFails, true
}

func (c *verifyCmd) run(e *env) int {
	if !c.limitFlags.apply(e) {
		return exitInput
	}
	ctx, cancel := c.timeoutFlag.budget()
	defer cancel()
	return within(ctx, e, func(ctx context.Context, e *env) int { return c.verify(ctx, e) })
}

func (c *verifyCmd) verify(ctx context.Context, e *env) int {
	name, src, err := readCertificate(c.Cert, e.stdin)
	if err != nil {
		return e.fail(exitInput, err)
	}
	doc, err := claims.Read(strings.NewReader(string(src)))
	if err != nil {
		return e.failf(exitInput, "%s: %w", name, err)
	}
	trusted, err := readTrusted(c.Trust)
	if err != nil {
		return e.fail(exitInput, err)
	}
	res := checker.VerifyContext(ctx, doc)
	if ctx.Err() != nil {
		return exitStopped
	}
	trust := trustOf(doc, trusted)
	if c.JSON {
		writeJSON(e.stdout, report.VerifyJSON(doc, res, trust))
	} else {
		report.VerifyText(e.stdout, name, doc, res, trust)
	}
	switch {
	case !res.Valid && limitReached(res):
		fmt.Fprintf(e.stderr, "lyacert: %s: not checked to the end: a limit was reached (see the failed check for the flag that raises it)\n", name)
		return exitInput
	case !res.Valid:
		return exitRejected
	case trust.Required && !trust.Trusted:
		return exitUntrusted
	}
	return exitHolds
}

func writeJSON(w io.Writer, v any) {
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	enc.SetIndent("", "  ")
	enc.Encode(v)
}
