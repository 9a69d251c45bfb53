package main

import (
	"regexp"
	"strings"
	"testing"
)

// TestBadFlagEveryCommand: every subcommand answers an unknown flag with at
// most three lines (the reason and where the help is), and exit 2.
func TestBadFlagEveryCommand(t *testing.T) {
	for _, c := range commands() {
		code, stdout, stderr := captureRun(c.name, "--no-such-flag")
		if code != exitUsage || stdout != "" {
			t.Errorf("%s: exit %d, stdout %q; want exit 2 and nothing on stdout", c.name, code, stdout)
		}
		if n := strings.Count(stderr, "\n"); n == 0 || n > 3 {
			t.Errorf("%s: %d lines on stderr, want 1 to 3:\n%s", c.name, n, stderr)
		}
		checkUsageError(t, c.name, c.name, stderr, "no-such-flag")
	}
	code, _, stderr := captureRun("no-such-command")
	if code != exitUsage || strings.Count(stderr, "\n") > 3 {
		t.Errorf("unknown command: exit %d, stderr:\n%s", code, stderr)
	}
}

// flagLine is an option line of flag.PrintDefaults: two spaces, the flag,
// and the value name when it takes one.
var flagLine = regexp.MustCompile(`^  -([a-z0-9-]+)(?: (.*))?$`)

// TestFlagValueNames: in every command's help, every flag that takes a
// value shows a value name in capitals (SHEET.csv, DEGREES), never the Go
// type (string, float) nor a stray phrase the flag package took from the
// help text (it once showed "-shadows gnomon sheet").
func TestFlagValueNames(t *testing.T) {
	valueName := regexp.MustCompile(`^[A-Z][A-Z0-9]*(\.[a-z]+)?$`)
	for _, c := range commands() {
		code, _, stderr := captureRun(c.name, "-h")
		if code != exitOK {
			t.Errorf("%s -h: exit %d", c.name, code)
			continue
		}
		for _, line := range strings.Split(stderr, "\n") {
			m := flagLine.FindStringSubmatch(line)
			if m == nil || m[2] == "" {
				continue // not an option line, or a switch (a bool flag)
			}
			if !valueName.MatchString(m[2]) {
				t.Errorf("%s -%s: value name %q, want a word in capitals", c.name, m[1], m[2])
			}
		}
	}
}
