package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
)

// Exit statuses shared by every subcommand.
const (
	exitOK      = 0 // the command did its job
	exitFailure = 1 // a runtime failure (unreadable input, unwritable output)
	exitUsage   = 2 // bad flags or values: a one-line reason, then the usage
)

// newFlagSet returns a flag set that reports errors instead of exiting, so
// that every command answers bad usage the same way (see parseFlags).
func newFlagSet(e env, name, synopsis, about string) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(e.stderr)
	fs.Usage = func() {
		w := fs.Output()
		fmt.Fprintf(w, "usage: %s\n\n%s\n\noptions:\n", synopsis, about)
		fs.PrintDefaults()
	}
	return fs
}

// parseFlags parses args. When it returns done, the caller returns code:
// 0 after -h, exitUsage after a bad flag (the flag package has already
// printed the reason and the usage).
func parseFlags(fs *flag.FlagSet, args []string) (code int, done bool) {
	err := fs.Parse(args)
	switch {
	case err == nil:
		return 0, false
	case errors.Is(err, flag.ErrHelp):
		return exitOK, true
	default:
		return exitUsage, true
	}
}

// usageErr prints a one-line reason and the command's usage, and returns
// exitUsage. Commands call it for values that parse but make no sense
// (a latitude beyond ±90°, --from after --to).
func usageErr(fs *flag.FlagSet, format string, a ...any) int {
	w := fs.Output()
	fmt.Fprintf(w, "gnomon %s: %s\n", fs.Name(), fmt.Sprintf(format, a...))
	fs.Usage()
	return exitUsage
}

// fail prints a one-line runtime error and returns exitFailure.
func fail(w io.Writer, cmd string, err error) int {
	fmt.Fprintf(w, "gnomon %s: %v\n", cmd, err)
	return exitFailure
}

// flagsSet returns the names of the flags given on the command line, so a
// command can tell "--lat 0" from no --lat at all.
func flagsSet(fs *flag.FlagSet) map[string]bool {
	set := map[string]bool{}
	fs.Visit(func(fl *flag.Flag) { set[fl.Name] = true })
	return set
}

// firstMissing returns the first of names that is not in set, or "".
func firstMissing(set map[string]bool, names ...string) string {
	for _, n := range names {
		if !set[n] {
			return n
		}
	}
	return ""
}
