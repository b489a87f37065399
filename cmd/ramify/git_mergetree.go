package main

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"github.com/ramify-tax/ramify/format"
)

// errUnknownTheirs says the merge driver cannot tell which commit is being
// merged into the current branch.
var errUnknownTheirs = errors.New("cannot tell which commit is being merged")

// theirsCommit is the commit being merged into HEAD. git merge names each
// commit it merges in an environment variable GITHEAD_<object id> for the
// programs it runs (git's builtin/merge.c sets them so that merge programs
// can label the sides); a merge of exactly one commit other than HEAD is
// what the driver can regenerate. Rebases and cherry-picks set none.
func theirsCommit(head string, environ []string) (string, error) {
	var found []string
	for _, kv := range environ {
		name, _, _ := strings.Cut(kv, "=")
		oid, ok := strings.CutPrefix(name, "GITHEAD_")
		if !ok || !isObjectID(oid) || oid == head {
			continue
		}
		found = append(found, oid)
	}
	if len(found) != 1 {
		return "", errUnknownTheirs
	}
	return found[0], nil
}

// isObjectID reports whether s is a full hexadecimal object id (SHA-1 or
// SHA-256).
func isObjectID(s string) bool {
	if len(s) != 40 && len(s) != 64 {
		return false
	}
	for i := 0; i < len(s); i++ {
		if !strings.ContainsRune("0123456789abcdef", rune(s[i])) {
			return false
		}
	}
	return true
}

// headCommit is the object id of HEAD in the work tree at top.
func headCommit(top string) (string, error) {
	out, err := runGit(top, gitOutputLimit, "rev-parse", "--verify", "--quiet", "HEAD^{commit}")
	if err != nil {
		return "", err
	}
	oid := strings.TrimSpace(string(out))
	if !isObjectID(oid) {
		return "", fmt.Errorf("git rev-parse HEAD printed %q", oid)
	}
	return oid, nil
}

// mergedTree merges ours and theirs in memory, as the merge in progress
// does, and returns the resulting tree and the paths left conflicted.
// git merge-tree (git 2.38 or later) writes only objects: neither the work
// tree nor the index changes. Outlines are kept as ours in that merge
// (merge.ramify.driver is overridden with "true", a driver that accepts
// %A as it is), so the driver does not call itself; the caller regenerates
// the outline anyway.
func mergedTree(top, ours, theirs string) (tree string, conflicted []string, err error) {
	out, err := runGit(top, gitOutputLimit*16,
		"-c", "merge."+gitDriverName+".driver=true",
		"merge-tree", "--write-tree", "--name-only", "--no-messages", "-z", ours, theirs)
	var ge *gitError
	if err != nil && !(errors.As(err, &ge) && ge.exitCode() == 1) {
		if ge != nil && strings.Contains(ge.stderr, "--write-tree") {
			return "", nil, errors.New("this git is too old to merge in memory (git merge-tree --write-tree needs git 2.38)")
		}
		return "", nil, err
	}
	// With -z the tree id and each conflicted path end in NUL (git
	// merge-tree's documentation, "OUTPUT").
	fields := strings.Split(strings.TrimSuffix(string(out), "\x00"), "\x00")
	if len(fields) == 0 || !isObjectID(fields[0]) {
		return "", nil, fmt.Errorf("git merge-tree printed no tree: %q", firstLineOf(string(out)))
	}
	seen := map[string]bool{}
	for _, p := range fields[1:] {
		if p != "" && !seen[p] {
			seen[p] = true
			conflicted = append(conflicted, p)
		}
	}
	sort.Strings(conflicted)
	return fields[0], conflicted, nil
}

// treeFile is one regular file of a git tree.
type treeFile struct {
	rel string // relative to the folder extracted
	oid string
}

// extractTree copies the regular files of tree under the folder sub
// ("." for all of it) into dest, byte for byte as git stores them.
// Symbolic links and submodules are skipped: ramify reads neither. dest is
// a private scratch folder, so the files are written plainly rather than
// atomically.
func extractTree(top, tree, sub, dest string) error {
	args := []string{"ls-tree", "-r", "-z", tree}
	if sub != "." {
		args = append(args, "--", sub)
	}
	out, err := runGit(top, 1<<30, args...)
	if err != nil {
		return err
	}
	var files []treeFile
	for _, entry := range strings.Split(strings.TrimSuffix(string(out), "\x00"), "\x00") {
		if entry == "" {
			continue
		}
		// "<mode> SP <type> SP <object> TAB <file>" (git ls-tree's
		// documentation, "OUTPUT FORMAT").
		meta, name, ok := strings.Cut(entry, "\t")
		parts := strings.Fields(meta)
		if !ok || len(parts) != 3 {
			return fmt.Errorf("git ls-tree printed %q", entry)
		}
		if parts[1] != "blob" || (parts[0] != "100644" && parts[0] != "100755") {
			continue
		}
		rel := name
		if sub != "." {
			rel, ok = strings.CutPrefix(name, sub+"/")
			if !ok {
				continue
			}
		}
		if msg := format.CheckRepoPath(rel); msg != "" {
			return fmt.Errorf("the merged tree holds %s", msg)
		}
		files = append(files, treeFile{rel: rel, oid: parts[2]})
	}
	return catBlobs(top, files, func(f treeFile, r io.Reader) error {
		full := filepath.Join(dest, filepath.FromSlash(f.rel))
		if err := os.MkdirAll(filepath.Dir(full), 0o755); err != nil {
			return err
		}
		w, err := os.Create(full)
		if err != nil {
			return err
		}
		if _, err := io.Copy(w, r); err != nil {
			w.Close()
			return err
		}
		return w.Close()
	})
}

// catBlobs streams the contents of files' blobs from one git cat-file
// --batch, handing each to each in order.
func catBlobs(top string, files []treeFile, each func(f treeFile, r io.Reader) error) error {
	if len(files) == 0 {
		return nil
	}
	var in bytes.Buffer
	for _, f := range files {
		if !isObjectID(f.oid) {
			return fmt.Errorf("git ls-tree gave %q as an object id", f.oid)
		}
		in.WriteString(f.oid + "\n")
	}
	cmd, err := gitCommand(top, "cat-file", "--batch")
	if err != nil {
		return err
	}
	cmd.Stdin = &in
	errOut := &cappedBuffer{limit: 64 << 10}
	cmd.Stderr = errOut
	pipe, err := cmd.StdoutPipe()
	if err != nil {
		return err
	}
	if err := cmd.Start(); err != nil {
		return err
	}
	r := bufio.NewReaderSize(pipe, 1<<16)
	readErr := func() error {
		for _, f := range files {
			// "<oid> SP <type> SP <size> LF <contents> LF" (git cat-file's
			// documentation, "BATCH OUTPUT").
			header, err := r.ReadString('\n')
			if err != nil {
				return fmt.Errorf("git cat-file --batch stopped early: %v", err)
			}
			parts := strings.Fields(header)
			if len(parts) != 3 || parts[0] != f.oid || parts[1] != "blob" {
				return fmt.Errorf("git cat-file --batch printed %q for %s", strings.TrimSpace(header), f.rel)
			}
			size, err := strconv.ParseInt(parts[2], 10, 64)
			if err != nil || size < 0 || size > format.MaxDataFileBytes {
				return fmt.Errorf("%s: %s bytes; the limit is %d", f.rel, parts[2], int64(format.MaxDataFileBytes))
			}
			body := io.LimitReader(r, size)
			if err := each(f, body); err != nil {
				return err
			}
			if _, err := io.Copy(io.Discard, body); err != nil {
				return err
			}
			if b, err := r.ReadByte(); err != nil || b != '\n' {
				return fmt.Errorf("git cat-file --batch: no newline after %s", f.rel)
			}
		}
		return nil
	}()
	if readErr != nil {
		cmd.Process.Kill()
		cmd.Wait()
		return readErr
	}
	if err := cmd.Wait(); err != nil {
		return &gitError{args: []string{"cat-file", "--batch"}, stderr: errOut.String(), err: err}
	}
	return nil
}
