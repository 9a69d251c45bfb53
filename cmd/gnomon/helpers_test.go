package main

import (
	"bytes"
	"strings"
	"testing"
)

// captureRun runs gnomon in-process with args and returns the exit status
// and what it printed.
func captureRun(args ...string) (code int, stdout, stderr string) {
	return captureRunEnv(nil, args...)
}

// captureRunEnv is captureRun with environment variables.
func captureRunEnv(vars map[string]string, args ...string) (code int, stdout, stderr string) {
	var o, e bytes.Buffer
	code = run(env{stdin: strings.NewReader(""), stdout: &o, stderr: &e, getenv: func(k string) string { return vars[k] }}, args)
	return code, o.String(), e.String()
}

// checkUsageError checks the shape every command gives bad usage: a first
// line holding the reason, then one line pointing at the command's help.
func checkUsageError(t *testing.T, name, cmd, stderr, reason string) {
	t.Helper()
	first, rest, _ := strings.Cut(stderr, "\n")
	if !strings.Contains(first, reason) {
		t.Errorf("%s: first stderr line %q lacks %q", name, first, reason)
	}
	if rest != "run 'gnomon "+cmd+" -h' for its options\n" {
		t.Errorf("%s: after the reason %q, want the pointer to the help alone", name, rest)
	}
}
