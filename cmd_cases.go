package main

import (
	"fmt"
	"io"

	"axiswim/cases"
)

func cmdCases(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("cases", stderr)
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	switch fs.NArg() {
	case 0:
		fmt.Fprintln(stdout, "embedded example cases (print one with 'axiswim cases NAME', save it and edit):")
		for _, n := range cases.List() {
			src, _ := cases.Get(n)
			c, err := cases.Parse(n, src)
			title := ""
			if err == nil {
				title = c.Run.Title
			}
			fmt.Fprintf(stdout, "  %-18s %s\n", n, title)
		}
		return nil
	case 1:
		src, err := cases.Get(fs.Arg(0))
		if err != nil {
			return usageErrorf("%w (list them with 'axiswim cases')", err)
		}
		_, err = stdout.Write(src)
		return err
	}
	return usageErrorf("one name at most")
}
