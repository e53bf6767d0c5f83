package main

import (
	"encoding/json"
	"fmt"
	"io"
	"text/tabwriter"

	"clatter/engine/verify"
)

var cmdVerify = &command{
	name:    "verify",
	summary: "run the built-in analytic cases: measured against expected",
	usage:   "clatter verify [--json] [--quiet]",
	help:    verifyHelp(), // verifyhelp.go
}

func verifyCases(e *env, args []string) int {
	fs := newFlags(e, cmdVerify)
	asJSON := fs.Bool("json", false, "")
	pos, code := parse(e, cmdVerify, fs, args)
	if code >= 0 {
		return code
	}
	if len(pos) > 0 {
		e.errorf("verify takes no arguments, got %q", pos[0])
		return exitBad
	}
	cases := verify.Cases()
	p := newProgress(e, "verifying")
	results := make([]verify.Result, len(cases))
	for i, c := range cases {
		results[i] = verify.Check(c)
		p.update(float64(i+1) / float64(len(cases)))
	}
	p.done()
	if *asJSON {
		b, err := json.MarshalIndent(results, "", "  ")
		if err != nil {
			e.errorf("verify: %v", err)
			return exitFailed
		}
		e.stdout.Write(append(b, '\n'))
	} else {
		writeVerifyTable(e.stdout, results)
	}
	if !verify.Passed(results) {
		n := 0
		for _, r := range results {
			if !r.Pass {
				n++
			}
		}
		e.errorf("verify: %d of %d cases failed", n, len(results))
		return exitFailed
	}
	return exitOK
}

func writeVerifyTable(w io.Writer, rs []verify.Result) {
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "#\tcase\texpected\tmeasured\tunit\terror\ttolerance\tresult")
	passed := 0
	for i, r := range rs {
		res := "pass"
		if r.Pass {
			passed++
		} else {
			res = "FAIL"
			if r.Problem != "" {
				res += ": " + r.Problem
			}
		}
		errText, tolText := fmt.Sprintf("%.3g", r.Error), fmt.Sprintf("%.3g", r.Tolerance)
		if r.Relative {
			errText, tolText = fmt.Sprintf("%.3g%%", 100*r.Error), fmt.Sprintf("%.3g%%", 100*r.Tolerance)
		}
		unit := r.Unit
		if unit == "" {
			unit = "-"
		}
		fmt.Fprintf(tw, "%d\t%s\t%.6g\t%.6g\t%s\t%s\t%s\t%s\n", i+1, r.Case, r.Expected, r.Measured, unit, errText, tolText, res)
	}
	tw.Flush()
	fmt.Fprintln(w)
	fmt.Fprintln(w, "references:")
	for i, r := range rs {
		fmt.Fprintf(w, "%3d  %s. Source: %s\n", i+1, r.Reference, r.Source)
	}
	fmt.Fprintln(w)
	fmt.Fprintf(w, "%d of %d cases passed\n", passed, len(rs))
}
