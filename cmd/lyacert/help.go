package main

import (
	"fmt"

	"github.com/alecthomas/kong"
)

// helpCmd answers "lyacert help [COMMAND...]" as "lyacert COMMAND --help".
type helpCmd struct {
	Command []string `arg:"" optional:"" placeholder:"COMMAND" help:"The command to explain (e.g. sweep, or key new); none for the overview."`
}

// completionCmd prints the shell code that asks lyacert for completions.
type completionCmd struct {
	Shell string `arg:"" enum:"bash,zsh,fish" placeholder:"SHELL" help:"bash, zsh or fish."`
}

func init() {
	register("help", "Show the help of a command, with examples: lyacert help sweep.", func() any { return &helpCmd{} })
	register("completion", "Print shell completion code for bash, zsh or fish.", func() any { return &completionCmd{} })
}

// Run prints the help by parsing the command with --help (kong prints it
// and exits 0; an unknown command is a usage error, exit 2).
func (h *helpCmd) Run(ctx *kong.Context) error {
	_, err := ctx.Kong.Parse(append(append([]string{}, h.Command...), "--help"))
	return err
}

// Help is the detailed help of lyacert help.
func (h *helpCmd) Help() string {
	return `Examples:
  lyacert help check        the options of check, with examples
  lyacert help key new      help on a subcommand`
}

// The shells ask the program itself for completions: they run it with the
// command line in COMP_LINE, and kongplete answers (see run).
var completionScripts = map[string]string{
	"bash": "complete -o default -C %[1]s %[1]s\n",
	"zsh":  "autoload -U +X bashcompinit && bashcompinit\ncomplete -o default -C %[1]s %[1]s\n",
	"fish": `function __complete_%[1]s
    set -lx COMP_LINE (commandline -cp)
    test -z (commandline -ct)
    and set COMP_LINE "$COMP_LINE "
    %[1]s
end
complete -f -c %[1]s -a "(__complete_%[1]s)"
`,
}

// Run prints the completion code for the shell.
func (c *completionCmd) Run(e *env) error {
	fmt.Fprintf(e.stdout, completionScripts[c.Shell], "lyacert")
	return nil
}

// Help is the detailed help of lyacert completion.
func (c *completionCmd) Help() string {
	return `The code makes the shell run lyacert to complete commands and flags.

Examples:
  source <(lyacert completion bash)                          bash, this shell
  lyacert completion bash > /etc/bash_completion.d/lyacert   bash, every shell
  lyacert completion zsh >> ~/.zshrc                         zsh
  lyacert completion fish > ~/.config/fish/completions/lyacert.fish   fish`
}

// The detailed help of each command: what --help and lyacert help CMD
// show under the usage line.

func (c *checkCmd) Help() string {
	return `Reads a model file (.lya), computes the derivative of its candidate V along
the flow exactly, completes the squares and says for which parameter values
the argument holds. With two or more free parameters the region is paved.

Examples:
  lyacert check model.lya
  lyacert check model.lya --set r=1/2 -o c.json
  lyacert check model.lya --box a=0..2 --box b=0..4 --plot region.svg
  lyacert check model.lya --json
  lyacert check - < model.lya

` + exitCodesText
}

func (c *verifyCmd) Help() string {
	return `Re-checks a certificate from scratch with exact arithmetic. A file changed
after it was written is reported as altered, with the claims that disagree
with the recomputation.

Examples:
  lyacert verify c.json
  lyacert verify c.json --trust alice.pub.pem
  lyacert verify c.json --json

Exit codes: 0 valid; 5 altered or invalid; 6 the mathematics passed but the
signer is not trusted (--trust); 2 not a certificate.`
}

func (c *demoCmd) Help() string {
	return `Checks the built-in demo model (an invented test-rig coolant loop). It
exits 0 when it ran; the verdict is in its output.

Examples:
  lyacert demo
  lyacert demo --report out/`
}

func (c *findCmd) Help() string {
	return `Finds the equilibria at fixed parameter values, classifies them and
certifies the model's own (its at point or the origin), or every one with
--all, from the linearization.

With parameters left free it analyses the equilibrium branches instead, as
exact functions of them: existence, Jacobian, characteristic polynomial,
Hurwitz determinants, and along one free parameter the exact pieces of its
range by type and stability and the bifurcation values (--plot draws the
diagram); over two or more, a map of boxes of their --box ranges, each
labelled where the exact tests decide it on the whole box (--plot draws it
for two). That analysis writes no certificate; it exits 0 when the branches
have a closed form, 1 when they do not. With --degree 2D --box-sos it
instead searches one V of that degree for every value in the box of the
free parameters' closed ranges, and certifies it (exit 0), or exits 1.

Examples:
  lyacert find model.lya --set r=20
  lyacert find model.lya --set r=20 --all -o c.json
  lyacert find model.lya --set r=20 --q 1,2,3 --json
  lyacert find lorenz.lya --set sigma=10 --set b=8/3 --plot branches.svg
  lyacert find model.lya --degree 2 --box-sos -o box.json
  lyacert find lorenz.lya --set sigma=10 --box r=0..30 --box b=0..4 --plot map.png

` + exitCodesText
}

func (c *sweepCmd) Help() string {
	return `Certifies the equilibria at every point of a grid of parameter values, in
parallel and resumably. A range is NAME=LO..HI; the number of points is said
with --points. The exit status follows the model's own equilibrium (its at
point or the origin) unless --all-equilibria asks for every one.

Examples:
  lyacert sweep model.lya --grid r=0..30 --points 61 -o r.jsonl
  lyacert sweep model.lya --grid a=1..2 --grid b=0..1 --points a=11 --points b=5 -o ab.jsonl
  lyacert sweep model.lya --grid r=0..30 --points 3001 -o r.jsonl --timeout 2h
  lyacert sweep model.lya --grid r=0..30 --points 3001 -o r.jsonl --resume
  lyacert sweep model.lya --grid r=0..30 --points 3001 -o part0.jsonl --shard 0/4

` + exitCodesText
}

func (c *mergeCmd) Help() string {
	return `Combines the outputs of the shards of one sweep into what one unsharded run
gives, byte for byte. Missing shards are named (exit 4).

Examples:
  lyacert merge part0.jsonl part1.jsonl part2.jsonl part3.jsonl -o all.jsonl
  lyacert merge part*.jsonl -o all.jsonl --plot all.svg --json

` + exitCodesText
}

func (c *reportCmd) Help() string {
	return `Writes a report of a certificate for reviews, safety cases and papers.

Examples:
  lyacert report c.json --format md -o c.md
  lyacert report c.json --format tex --whole-document -o c.tex
  lyacert report c.json --format html -o c.html --json`
}

func (c *signCmd) Help() string {
	return `Signs a certificate that the checker accepts with an ed25519 private key.

Examples:
  lyacert key new -o alice
  lyacert sign c.json --key alice.key
  lyacert verify c.json --trust alice.pub.pem`
}

func (c *keyNewCmd) Help() string {
	return `Example:
  lyacert key new -o alice      writes alice.key and alice.pub.pem`
}
