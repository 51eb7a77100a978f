// Command specgen builds documentation sites whose engineering numbers are
// computed from calculation blocks in the pages.
package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"path/filepath"
	"syscall"

	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/site"
	"github.com/millrace-workshop/specgen/internal/version"
)

// Exit statuses.
const (
	exitOK       = 0
	exitFailed   = 1 // a failed claim or a danger-level caution
	exitBadInput = 2 // bad input or usage
)

// command is one subcommand.
type command struct {
	name    string
	summary string
	run     func(args []string, stdout, stderr io.Writer) int
}

func commands() []command {
	return []command{
		{"build", "build the site into the output folder", runBuild},
		{"check", "evaluate every calculation and claim without writing a site", runCheck},
		{"preview", "serve the site on this machine and rebuild it as you edit", runPreview},
		{"diff", "compare the calculations of two revisions, as Markdown for a pull request", runDiff},
		{"calc", "evaluate one calculation block from a TOML file", runCalc},
		{"explain", "list the kinds of calculation, or explain one", runExplain},
		{"init", "write a new site with an example page into an empty folder", runInit},
		{"version", "print the version", runVersion},
		{"help", "show help for a command", runHelp},
	}
}

func main() {
	// A soft memory limit that follows the live heap (memory.go): a big
	// site's peak stays within a share above what it holds, and the
	// collector never runs without pause. GOMEMLIMIT, when set, wins.
	if os.Getenv("GOMEMLIMIT") == "" {
		followLiveHeap()
	}
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

func run(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		usage(stderr)
		return exitBadInput
	}
	name := args[0]
	switch name {
	case "-h", "-help", "--help":
		usage(stdout)
		return exitOK
	case "-version", "--version":
		return runVersion(args[1:], stdout, stderr)
	}
	for _, c := range commands() {
		if c.name == name {
			return c.run(args[1:], stdout, stderr)
		}
	}
	fmt.Fprintf(stderr, "specgen: unknown command %q\n\n", name)
	usage(stderr)
	return exitBadInput
}

func usage(w io.Writer) {
	fmt.Fprintln(w, "specgen: build documentation whose numbers are computed, not typed.")
	fmt.Fprintln(w, "\nUsage: specgen COMMAND [options]\n\nCommands:")
	for _, c := range commands() {
		fmt.Fprintf(w, "  %-9s %s\n", c.name, c.summary)
	}
	fmt.Fprintln(w, "\nExit status: 0 all is well, 1 a claim fails or a DANGER caution is not acknowledged (check, build -strict;")
	fmt.Fprintln(w, "diff: newly), 2 bad input.")
	fmt.Fprintln(w, "\nRun 'specgen help COMMAND' for a command's options.")
}

// newFlags returns a flag set whose errors go to stderr and do not exit.
func newFlags(name, synopsis string, stderr io.Writer) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() {
		fmt.Fprintf(fs.Output(), "Usage: specgen %s\n", synopsis)
		any := false
		fs.VisitAll(func(*flag.Flag) { any = true })
		if any {
			fmt.Fprintln(fs.Output(), "\nOptions:")
			fs.PrintDefaults()
		}
	}
	return fs
}

// parseFlags parses args and rejects stray arguments. It returns the exit
// status to use when parsing did not succeed, or -1.
func parseFlags(fs *flag.FlagSet, args []string) int {
	pos, code := parseOnly(fs, args)
	if code >= 0 {
		return code
	}
	if len(pos) > 0 {
		hint := ""
		if info, err := os.Stat(filepath.Join(pos[0], "content")); err == nil && info.IsDir() && fs.Lookup("C") != nil {
			hint = fmt.Sprintf("; name the site root with -C: specgen %s -C %s", fs.Name(), pos[0])
		}
		fmt.Fprintf(fs.Output(), "specgen %s: unexpected argument %q%s\n", fs.Name(), pos[0], hint)
		fs.Usage()
		return exitBadInput
	}
	return -1
}

// parseOnly parses the flags of a command that takes arguments too, and
// returns the arguments. Options may follow them ("diff main -C docs"),
// unless after "--". The status is the exit status when parsing ended the
// command (-h asks for help: exit 0), or -1.
func parseOnly(fs *flag.FlagSet, args []string) ([]string, int) {
	var pos []string
	for {
		if err := fs.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				return nil, exitOK
			}
			return nil, exitBadInput
		}
		rest := fs.Args()
		if len(rest) == 0 {
			return pos, -1
		}
		if i := len(args) - len(rest); i > 0 && args[i-1] == "--" {
			return append(pos, rest...), -1
		}
		pos = append(pos, rest[0])
		args = rest[1:]
	}
}

// report prints an error and returns exit status 2. Input errors already
// start with their file:line; other failures (a disk, a permission) get the
// program's name.
func report(stderr io.Writer, err error) int {
	if inputerr.Is(err) {
		fmt.Fprintln(stderr, err)
	} else {
		fmt.Fprintln(stderr, "specgen:", err)
	}
	return exitBadInput
}

func runBuild(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("build", "build [-C dir] [-out dir] [-strict] [-quiet]\n\n"+
		"Builds the site into the output folder. A failed claim is marked on its page and listed, and the site is\n"+
		"still written (exit 0); with -strict, a failed claim or an unacknowledged DANGER caution writes nothing\n"+
		"and exits 1. Bad input: exit 2.", stderr)
	dir := fs.String("C", ".", "site root: the folder holding content/")
	out := fs.String("out", site.DefaultOut, "output folder, relative to the site root")
	strict := fs.Bool("strict", false, "fail like check, writing nothing, when a claim fails or a DANGER caution is raised")
	quiet := fs.Bool("quiet", false, "print nothing but errors and problems")
	if code := parseFlags(fs, args); code >= 0 {
		return code
	}
	// Ctrl-C or a CI job's SIGTERM removes the unfinished output instead
	// of leaving a hidden half-built folder beside it.
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	opts := site.Options{Out: *out, Strict: *strict, Context: ctx}
	var prog *progress
	if !*quiet {
		prog = newProgress(stderr)
		opts.Progress = prog.update
	}
	sum, err := site.Build(*dir, opts)
	if prog != nil {
		prog.done()
	}
	if err != nil {
		return report(stderr, err)
	}
	printProblems(stderr, sum.Problems)
	if !sum.Written {
		fmt.Fprintf(stderr, "build -strict: %s; nothing written\n", count(len(sum.Problems), "problem"))
		return exitFailed
	}
	if !*quiet {
		verb := "built"
		if sum.UpToDate {
			verb = "up to date:"
		}
		fmt.Fprintf(stdout, "%s %s in %s\n", verb, count(sum.Pages, "page"), sum.Out)
		fmt.Fprintln(stdout, tallyLine(sum.Tally))
	}
	return exitOK
}

func runVersion(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("version", "version   (or specgen --version)\n\n"+
		"Prints the release this specgen was built from (v0.1.0), or for a build from source the commit, with\n"+
		"+dirty when the source had uncommitted changes.", stderr)
	if code := parseFlags(fs, args); code >= 0 {
		return code
	}
	fmt.Fprintln(stdout, version.Generator())
	return exitOK
}

func runHelp(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		usage(stdout)
		return exitOK
	}
	if args[0] == "help" {
		fmt.Fprintln(stdout, "Usage: specgen help [COMMAND]\n\nLists the commands, or shows one command's options.")
		return exitOK
	}
	for _, c := range commands() {
		if c.name == args[0] {
			return c.run([]string{"-h"}, stdout, stdout)
		}
	}
	fmt.Fprintf(stderr, "specgen help: unknown command %q\n", args[0])
	return exitBadInput
}
