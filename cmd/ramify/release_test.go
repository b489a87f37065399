package main

import (
	"os"
	"path/filepath"
	"regexp"

	"github.com/rogpeppe/go-internal/testscript"
)

// cmdAnswerAll answers every open packet the way a reviewer does in an
// editor: answerall VERDICT REVIEWER sets the "verdict:" and "reviewer:"
// lines of each reviews/open/*.outline and leaves the tree as it is.
func cmdAnswerAll(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) != 2 {
		ts.Fatalf("usage: answerall VERDICT REVIEWER")
	}
	verdict := regexp.MustCompile(`(?m)^verdict: .*$`)
	reviewer := regexp.MustCompile(`(?m)^reviewer:.*$`)
	files, err := filepath.Glob(ts.MkAbs(filepath.Join("reviews", "open", "*.outline")))
	ts.Check(err)
	if len(files) == 0 {
		ts.Fatalf("no open packets")
	}
	for _, f := range files {
		data, err := os.ReadFile(f)
		ts.Check(err)
		data = verdict.ReplaceAll(data, []byte("verdict: "+args[0]))
		data = reviewer.ReplaceAll(data, []byte("reviewer: "+args[1]))
		ts.Check(os.WriteFile(f, data, 0o644))
	}
}
