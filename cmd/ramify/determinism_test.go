package main

import (
	"os"
	"path/filepath"
	"runtime"
	"testing"
)

// TestSolveSameBytesAnyGOMAXPROCS regenerates the demo from nothing with
// one and with two threads: users diff the outline in git, so the bytes
// must not depend on the machine.
func TestSolveSameBytesAnyGOMAXPROCS(t *testing.T) {
	var outs [][]byte
	for _, procs := range []int{1, 2, 1} {
		dir := t.TempDir()
		copyTree(t, demoDir, dir)
		if err := os.Remove(filepath.Join(dir, "taxonomy.outline")); err != nil {
			t.Fatal(err)
		}
		prev := runtime.GOMAXPROCS(procs)
		code, _, stderr := runIn("solve", "--dir", dir)
		runtime.GOMAXPROCS(prev)
		if code != 0 {
			t.Fatalf("solve with GOMAXPROCS=%d: exit %d\n%s", procs, code, stderr)
		}
		data, err := os.ReadFile(filepath.Join(dir, "taxonomy.outline"))
		if err != nil {
			t.Fatal(err)
		}
		outs = append(outs, data)
	}
	for i := 1; i < len(outs); i++ {
		if string(outs[i]) != string(outs[0]) {
			t.Fatalf("outline differs between runs 0 and %d", i)
		}
	}
}
