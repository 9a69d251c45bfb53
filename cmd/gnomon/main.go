// Command gnomon tells an examiner whether the capture times of a folder of
// photos can be trusted, by checking each claimed moment against where the
// sun really was and against the other clocks a photo carries.
//
// This file is the composition root: it only dispatches subcommands. Each
// subcommand lives in its own file and wires flags to the packages that do
// the work (exifread → solarcheck → report).
package main

import (
	"fmt"
	"io"
	"os"
)

// version is the tool's version, stamped into every report. Release builds
// may override it with -ldflags "-X main.version=…".
var version = "0.1.0-dev"

// env is what a subcommand may touch of the outside world. Passing it in,
// rather than reaching for os.Stdout, lets tests run commands in-process.
type env struct {
	stdin  io.Reader
	stdout io.Writer
	stderr io.Writer
	// getenv reads an environment variable (SOURCE_DATE_EPOCH and the like).
	getenv func(string) string
}

// command is one subcommand: its name, a one-line summary for `gnomon help`,
// and the function that runs it. run returns the process exit status:
// 0 success, 1 runtime failure, 2 bad usage.
type command struct {
	name    string
	summary string
	run     func(e env, args []string) int
}

// commands lists the subcommands in the order `gnomon help` shows them.
func commands() []command {
	return []command{
		{"sun", "position of the sun at a time and place", runSun},
		{"when", "times at which the sun matched a measured direction or shadow", runWhen},
		{"where", "place on Earth consistent with a measured sun direction at a time", runWhere},
		{"meta", "print the normalised evidence read from photos", runMeta},
		{"sheet", "write a measurement-sheet template for the photos in folders", runSheet},
		{"audit", "check every photo under folders and write the reports", runAudit},
		{"demo", "build an invented case, audit it and show where the report is", runDemo},
		{"selftest", "run the built-in published reference checks", runSelftest},
		{"version", "print the version", runVersion},
	}
}

func main() {
	e := env{stdin: os.Stdin, stdout: os.Stdout, stderr: os.Stderr, getenv: os.Getenv}
	os.Exit(run(e, os.Args[1:]))
}

// run dispatches args[0] to its subcommand.
func run(e env, args []string) int {
	if len(args) == 0 {
		printHelp(e.stderr)
		return exitUsage
	}
	name := args[0]
	switch name {
	case "help", "-h", "-help", "--help":
		if len(args) > 1 {
			for _, c := range commands() {
				if c.name == args[1] {
					return c.run(e, []string{"-h"})
				}
			}
		}
		printHelp(e.stdout)
		return exitOK
	}
	for _, c := range commands() {
		if c.name == name {
			return c.run(e, args[1:])
		}
	}
	fmt.Fprintf(e.stderr, "gnomon: unknown command %q\n", name)
	fmt.Fprintln(e.stderr, "run 'gnomon help' for the commands")
	return exitUsage
}

func printHelp(w io.Writer) {
	fmt.Fprintln(w, "usage: gnomon COMMAND [options]")
	fmt.Fprintln(w)
	fmt.Fprintln(w, "commands:")
	for _, c := range commands() {
		fmt.Fprintf(w, "  %-9s %s\n", c.name, c.summary)
	}
	fmt.Fprintln(w, "  help      this text; `gnomon help COMMAND` or `gnomon COMMAND -h` for one command")
	fmt.Fprintln(w)
	fmt.Fprintln(w, "Results are investigative aids, to be confirmed by a qualified examiner under local rules of evidence.")
}

func runVersion(e env, args []string) int {
	fs := newFlagSet(e, "version", "gnomon version", "Print the tool's version.")
	if code, done := parseFlags(fs, args); done {
		return code
	}
	fmt.Fprintf(e.stdout, "gnomon %s\n", version)
	return exitOK
}
