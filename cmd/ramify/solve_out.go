package main

import (
	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/repo"
	"github.com/ramify-tax/ramify/solve/regen"
)

// solveElsewhere handles where solve's tree goes when it is not simply the
// committed outline: with --out FILE it goes to FILE and the taxonomy is
// left alone; the average-linkage baseline ignores every record, so it
// replaces the taxonomy only with --replace, and solve says what it
// breaks either way. handled is true when solve is done (written to
// --out, or refused).
func solveElsewhere(e *env, o *solveOptions, rep *solveReport, p *repo.Repo, sol *regen.Solution) (handled bool, err error) {
	method, out, replace, dryRun := regen.Method(o.method), o.out, o.replace, o.dryRun
	rel := p.Settings.Taxonomy.File
	violated := sol.Compiled.EditorialViolated(sol.Violated)
	broken := len(violated)
	total := sol.Compiled.Editorial()
	if method == regen.MethodAverage && broken > 0 {
		e.notice("the average-linkage tree breaks %d of %s:", broken, plural(total, "constraint record", "constraint records"))
		for i, r := range violated {
			if i == 10 {
				e.notice("  ... and %d more", broken-10)
				break
			}
			e.notice("  %s", describeRecord(sol.Compiled.Records[r]))
		}
	}
	if out != "" {
		if replace {
			return true, usagef("--out and --replace do not go together: --out leaves %s alone", rel)
		}
		if msg := format.CheckRepoPath(out); msg != "" {
			return true, usagef("--out: %s", msg)
		}
		if out == rel {
			return true, usagef("--out %s is the taxonomy itself; leave --out away to write it", out)
		}
		full, err := repo.Resolve(p.Dir, out)
		if err != nil {
			return true, usagef("--out: %v", err)
		}
		written := !dryRun
		rep.Out, rep.Written = out, &written
		printSolveReport(e, rep, p, sol)
		if dryRun {
			e.say("would write %s (dry run: nothing written); %s is left alone", out, rel)
			return true, nil
		}
		if err := format.WriteFileAtomic(full, sol.Text, 0o644); err != nil {
			return true, err
		}
		e.say("wrote %s; %s is left alone", out, rel)
		return true, nil
	}
	if method == regen.MethodAverage && broken > 0 && !replace && !dryRun {
		rep.Written = new(bool)
		return true, usagef("--method average would replace %s with a tree that breaks %d of %s; write it elsewhere with --out FILE, or pass --replace to replace the taxonomy anyway",
			rel, broken, plural(total, "record", "records"))
	}
	return false, nil
}
