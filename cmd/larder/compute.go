package main

import (
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"

	"larder/internal/fuel"
)

// runCompute is `larder compute [--in FILE]`: one JSON request from stdin
// or FILE, the plan as JSON on stdout. Exit 0 on success, 2 for invalid
// input (each field at fault named on stderr), 1 for any other error.
func runCompute(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("compute", flag.ContinueOnError)
	fs.SetOutput(stderr)
	in := fs.String("in", "", "read the request from `FILE` instead of stdin")
	fs.Usage = func() {
		fmt.Fprintln(stderr, "usage: larder compute [--in FILE] < request.json > plan.json")
		fmt.Fprintln(stderr, "Computes a carbohydrate plan from one JSON request (see testdata/fuel/ for examples).")
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return 0
		}
		return 2
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(stderr, "larder compute: unexpected argument %q\n", fs.Arg(0))
		fs.Usage()
		return 2
	}
	r := stdin
	if *in != "" {
		f, err := os.Open(*in)
		if err != nil {
			fmt.Fprintf(stderr, "larder compute: %v\n", err)
			return 1
		}
		defer f.Close()
		r = f
	}
	req, err := fuel.DecodeRequest(r)
	if err == nil {
		var plan fuel.Plan
		plan, err = fuel.Compute(req)
		if err == nil {
			enc := json.NewEncoder(stdout)
			enc.SetIndent("", "  ")
			if err := enc.Encode(plan); err != nil {
				fmt.Fprintf(stderr, "larder compute: writing the plan: %v\n", err)
				return 1
			}
			return 0
		}
	}
	var verr fuel.ValidationError
	if errors.As(err, &verr) {
		fmt.Fprintln(stderr, "larder compute: the request is not valid:")
		for _, fe := range verr {
			fmt.Fprintf(stderr, "  %s: %s\n", fe.Field, fe.Message)
		}
		return 2
	}
	fmt.Fprintf(stderr, "larder compute: %v\n", err)
	return 1
}
