package main

import (
	"fmt"

	"github.com/gnomon-forensics/gnomon/internal/selftest"
)

func runSelftest(e env, args []string) int {
	fs := newFlagSet(e, "selftest", "gnomon selftest",
		"Run the published reference checks built into this binary (the SPA report's example, a Meeus\n"+
			"example, a WMM2025 test value, a zone lookup) and print each with pass or fail. Every audit runs\n"+
			"them too and records the result in its report. Exit 1 when any check fails.")
	if _, code, done := parseNoArgs(fs, args); done {
		return code
	}
	r := selftest.Run(nil)
	for _, c := range r.Checks {
		mark := "pass"
		if !c.Passed {
			mark = "FAIL"
		}
		fmt.Fprintf(e.stdout, "%s  %s\n      %s\n      source: %s\n", mark, c.Name, c.Detail, c.Source)
	}
	if !r.Passed {
		fmt.Fprintln(e.stdout, "self-test FAILED: do not rely on this build")
		return exitFailure
	}
	fmt.Fprintf(e.stdout, "all %d reference checks passed (gnomon %s)\n", len(r.Checks), version)
	return exitOK
}
