package main

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/rogpeppe/go-internal/testscript"
)

// TestMain lets testscript run the ramify binary in-process: scripts call
// `ramify ...` and get this package's run function.
//
// The committee cache is off unless RAMIFY_CACHE says otherwise, so that
// tests leave the user's cache folder alone and every test solves its own
// committee; review_cache.txtar turns it on in a folder of its own.
func TestMain(m *testing.M) {
	if os.Getenv("RAMIFY_CACHE") == "" {
		os.Setenv("RAMIFY_CACHE", "off")
	}
	testscript.Main(m, map[string]func(){
		"ramify": func() { os.Exit(run(os.Args[1:], os.Stdout, os.Stderr)) },
	})
}

// TestScripts runs the end-to-end scripts under testdata/script. Each
// script gets a fresh folder; the demo repository is copied in as
// $DEMO so scripts can work on a real taxonomy.
func TestScripts(t *testing.T) {
	demo, err := filepath.Abs(filepath.Join("..", "..", "examples", "tool-library"))
	if err != nil {
		t.Fatal(err)
	}
	testscript.Run(t, testscript.Params{
		Dir: filepath.Join("testdata", "script"),
		Setup: func(env *testscript.Env) error {
			env.Setenv("DEMO_SRC", demo)
			env.Setenv("RAMIFY_CACHE", "off")
			env.Setenv("NO_COLOR", "1")
			return nil
		},
		Cmds: map[string]func(ts *testscript.TestScript, neg bool, args []string){
			"copydemo":  cmdCopyDemo,
			"answerall": cmdAnswerAll,
			"hand":      cmdHand,
			// Decisions that must survive (decision_script_test.go).
			"movecategory":  cmdMoveCategory,
			"uniquerecords": cmdUniqueRecords,
			"killtrials":    cmdKillTrials,
			"typename":      cmdTypeName,
		},
		UpdateScripts: os.Getenv("RAMIFY_UPDATE") == "1",
	})
}

// cmdCopyDemo copies the demo repository into the script's work folder:
// copydemo DEST.
func cmdCopyDemo(ts *testscript.TestScript, neg bool, args []string) {
	if neg || len(args) != 1 {
		ts.Fatalf("usage: copydemo DEST")
	}
	ts.Check(copyDir(ts.Getenv("DEMO_SRC"), ts.MkAbs(args[0])))
}
