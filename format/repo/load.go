package repo

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/format/shape"
)

// SettingsFile is the name of the settings file at a repository's root.
const SettingsFile = "ramify.toml"

// HandEditPrefix begins the name of every constraint file that absorb
// writes for hand edits of the outline (constraints/edit-HASH.toml).
const HandEditPrefix = "edit-"

// MaxConstraintFiles bounds how many constraint files a repository may
// hold, so a hostile pull request cannot make a check run for hours.
const MaxConstraintFiles = 10000

// Repo is a loaded taxonomy repository.
type Repo struct {
	Dir      string
	Settings *format.Settings
	// Items are in id order, whatever the order of the items files.
	Items []format.Item
	// Index maps an item id to its position in Items.
	Index   map[string]int
	Vectors *format.Vectors
	// Links holds the explicit similarities of each links source, keyed
	// by the source's file.
	Links       map[string]*format.LinkTable
	Constraints []*format.ConstraintFile
	// Outline is the committed taxonomy, nil when the file does not exist
	// yet (a new repository before its first solve).
	Outline *format.Outline
	// Warnings are inputs that are not read but are no error: files in
	// the constraints folder that look meant as constraint files. Every
	// command may go on; `check --strict` fails on them.
	Warnings format.Diags
	// OutlineText is the outline file's bytes as read.
	OutlineText []byte
	// NameSources are other versions of the outline (the other side of a
	// merge) whose confirmed names were typed by people and count as such
	// when naming a regenerated tree (regen.Regenerate); their concept
	// identifiers are carried too, after the outline's, so a category made
	// on either branch keeps its identifier.
	NameSources []*format.Category
	// itemsBroken is set when an items file failed to parse; references
	// to items are then not checked.
	itemsBroken bool
	// bytesRead counts the bytes of the text inputs read so far, against
	// limits.bytes.
	bytesRead int64
	// linkItems is, for each links table, the item index of each of its
	// ids (-1 for an id that is no item), looked up once by Load for its
	// check and the similarity graph both.
	linkItems map[*format.LinkTable][]int32
}

// ItemIDs lists the item ids in index order (position i is item i of the
// graph and of every solver tree).
func (p *Repo) ItemIDs() []string {
	ids := make([]string, len(p.Items))
	for i, it := range p.Items {
		ids[i] = it.ID
	}
	return ids
}

// ItemIndex is the index of the item id (its position in Items, in the
// graph and in every solver tree) as the solver numbers leaves, and
// whether the repository has such an item.
func (p *Repo) ItemIndex(id string) (int32, bool) {
	i, ok := p.Index[id]
	return int32(i), ok
}

// OutlinePath is the taxonomy file's path on disk.
func (p *Repo) OutlinePath() string {
	full, err := Resolve(p.Dir, p.Settings.Taxonomy.File)
	if err != nil {
		return filepath.Join(p.Dir, p.Settings.Taxonomy.File)
	}
	return full
}

// Load reads every input of the repository at dir and checks it. It
// returns the repository together with every problem found; callers decide
// whether problems are fatal (they always are for commands that write).
func Load(dir string) (*Repo, format.Diags) {
	p := &Repo{Dir: dir, Index: map[string]int{}, Links: map[string]*format.LinkTable{}}
	var ds format.Diags
	settingsData, err := ReadSettingsFile(dir)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			ds.Add(format.Pos{File: SettingsFile}, "no %s here; run `ramify init` to start a taxonomy repository, or pass --dir", SettingsFile)
			return nil, ds
		}
		return nil, format.AsDiags(err, SettingsFile)
	}
	settings, err := format.ParseSettings(SettingsFile, settingsData)
	if err != nil {
		return nil, format.AsDiags(err, SettingsFile)
	}
	p.Settings = settings

	// Problems are reported in load order (items before the files that
	// refer to them), sorted by position within each step. When the items
	// themselves are broken, references to them cannot be judged, so the
	// "unknown item" checks are skipped rather than flooding the report.
	// The outline is the largest file after the links and needs nothing
	// else to be parsed, so it is parsed while the others load; at its
	// turn it is read as before and the early parse used only when the
	// bytes are the same.
	early := p.parseOutlineEarly()
	itemDs := p.loadItems()
	p.itemsBroken = len(itemDs) > 0
	for _, step := range []func() format.Diags{
		func() format.Diags { return itemDs },
		p.loadVectors, p.loadLinks, p.loadConstraints, func() format.Diags { return p.loadOutline(early) },
	} {
		sds := step()
		sds.Sort()
		ds = append(ds, sds...)
	}
	return p, ds
}

// read opens a configured file through Resolve and the size limit.
func (p *Repo) read(rel string, limit int64, keyPos format.Pos) ([]byte, format.Diags) {
	full, err := Resolve(p.Dir, rel)
	if err != nil {
		return nil, format.Diags{{Pos: keyPos, Msg: err.Error()}}
	}
	return p.readResolved(full, rel, limit, keyPos)
}

// readResolved reads a resolved file of at most limit bytes, counting it
// against limits.bytes from its size before anything is read.
func (p *Repo) readResolved(full, rel string, limit int64, keyPos format.Pos) ([]byte, format.Diags) {
	budget := int64(p.Settings.Limits.Bytes)
	if info, err := os.Stat(full); err == nil && info.Mode().IsRegular() && p.bytesRead+info.Size() > budget {
		return nil, format.Diags{{Pos: format.Pos{File: rel, Line: 1, Col: 1}, Msg: fmt.Sprintf(
			"this file is %d bytes, which brings the inputs read so far to %d: %s", info.Size(), p.bytesRead+info.Size(),
			format.OverLimit("bytes of input files", int(budget), "limits.bytes"))}}
	}
	// The file may grow between the size and the read: the read stops at
	// what is left of the budget too.
	data, err := format.ReadFileLimited(full, rel, min(limit, budget-p.bytesRead))
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return nil, format.Diags{{Pos: keyPos, Msg: "file " + rel + " does not exist"}}
		}
		return nil, format.AsDiags(err, rel)
	}
	p.bytesRead += int64(len(data))
	return data, nil
}

// readBinary opens a repository file of at most limit bytes and hands it
// to decode as a random-access reader, for formats read in place.
func (p *Repo) readBinary(rel string, limit int64, keyPos format.Pos, decode func(io.ReaderAt, int64) error) error {
	full, err := Resolve(p.Dir, rel)
	if err != nil {
		return format.Diags{{Pos: keyPos, Msg: err.Error()}}
	}
	f, err := os.Open(full)
	if errors.Is(err, fs.ErrNotExist) {
		return format.Diags{{Pos: keyPos, Msg: "file " + rel + " does not exist"}}
	}
	if err != nil {
		return err
	}
	defer f.Close()
	info, err := f.Stat()
	switch {
	case err != nil:
		return err
	case !info.Mode().IsRegular():
		return format.Diags{{Pos: format.Pos{File: rel}, Msg: "not a regular file"}}
	case info.Size() > limit:
		return format.Diags{{Pos: format.Pos{File: rel}, Msg: fmt.Sprintf("file is %d bytes; the limit for this kind of file is %d", info.Size(), limit)}}
	}
	return decode(f, info.Size())
}

func (p *Repo) keyPos(key string) format.Pos {
	if pos, ok := p.Settings.KeyPos[key]; ok {
		return pos
	}
	return format.Pos{File: SettingsFile, Line: 1, Col: 1}
}

func (p *Repo) loadItems() format.Diags {
	var ds format.Diags
	firstSeen := map[string]format.Pos{}
	for _, rel := range p.Settings.Items.Files {
		data, rds := p.read(rel, format.MaxDataFileBytes, p.keyPos("items.files"))
		if len(rds) > 0 {
			ds = append(ds, rds...)
			continue
		}
		lim := p.Settings.Limits.Items
		items, err := format.ParseItemsWithin(rel, data, format.Budget{Left: lim - len(p.Items), Over: format.OverLimit("items", lim, "limits.items")})
		if err != nil {
			ds = append(ds, format.AsDiags(err, rel)...)
			continue
		}
		if len(p.Settings.Items.Files) == 1 {
			// The parser has refused an id given twice within one file.
			p.Items = items
			continue
		}
		for _, it := range items {
			if prev, dup := firstSeen[it.ID]; dup {
				ds.Add(it.Pos, "item %q is defined twice (first at %s)", it.ID, prev)
				continue
			}
			firstSeen[it.ID] = it.Pos
			p.Items = append(p.Items, it)
		}
	}
	// Everything downstream works on item indices; in id order they, and
	// so every output, do not depend on the order of the lines or on how
	// the items are split over files. Ids are distinct, so the order is
	// the same by any sort; sorting positions moves less than items.
	order := make([]int32, len(p.Items))
	for i := range order {
		order[i] = int32(i)
	}
	slices.SortFunc(order, func(a, b int32) int { return strings.Compare(p.Items[a].ID, p.Items[b].ID) })
	sorted := make([]format.Item, len(p.Items))
	p.Index = make(map[string]int, len(p.Items))
	for i, k := range order {
		sorted[i] = p.Items[k]
		p.Index[sorted[i].ID] = i
	}
	p.Items = sorted
	return ds
}

// usesKind reports whether a similarity source of this kind is configured.
func (p *Repo) usesKind(kind string) bool {
	for _, s := range p.Settings.Similarity.Sources {
		if s.Kind == kind {
			return true
		}
	}
	return false
}

func (p *Repo) loadVectors() format.Diags {
	rel := p.Settings.Items.Vectors
	if rel == "" {
		return nil
	}
	var v *format.Vectors
	var err error
	switch ext := strings.ToLower(path.Ext(rel)); ext {
	case ".npy", ".parquet":
		ids := p.Settings.Items.VectorIDs
		var idData []byte
		if ext == ".npy" {
			var ds format.Diags
			if idData, ds = p.read(ids, format.MaxDataFileBytes, p.keyPos("items.vector_ids")); len(ds) > 0 {
				return ds
			}
		}
		// Binary matrices are decoded as they are read, never held whole
		// besides their values: a million float32 embeddings of 384
		// dimensions are 1.5 GB on disk and again in memory.
		err = p.readBinary(rel, format.MaxVectorFileBytes, p.keyPos("items.vectors"), func(r io.ReaderAt, size int64) error {
			var rerr error
			if ext == ".npy" {
				v, rerr = format.ReadNPYVectors(rel, r, size, ids, idData)
			} else {
				v, rerr = format.ReadParquetVectors(rel, r, size, p.Settings.Items.VectorColumn)
			}
			return rerr
		})
	default:
		data, ds := p.read(rel, format.MaxDataFileBytes, p.keyPos("items.vectors"))
		if len(ds) > 0 {
			return ds
		}
		v, err = format.ParseVectors(rel, data)
	}
	if err != nil {
		return format.AsDiags(err, rel)
	}
	var ds format.Diags
	p.Vectors = v
	seen := make(map[string]bool, len(v.IDs))
	for i, id := range v.IDs {
		seen[id] = true
		if _, ok := p.Index[id]; !ok && !p.itemsBroken {
			ds.Add(v.RowPos[i], "vector row for unknown item %q", id)
		}
	}
	if p.usesKind("vector") && !p.itemsBroken {
		for _, it := range p.Items {
			if !seen[it.ID] {
				ds.Add(it.Pos, "item %q has no row in %s", it.ID, rel)
			}
		}
	}
	return ds
}

func (p *Repo) loadLinks() format.Diags {
	var ds format.Diags
	linksRead := 0
	for i, src := range p.Settings.Similarity.Sources {
		if src.Kind != "links" || src.File == "" {
			continue
		}
		if _, done := p.Links[src.File]; done {
			continue
		}
		data, rds := p.read(src.File, format.MaxDataFileBytes, p.keyPos(sourceKey(i, "file")))
		if len(rds) > 0 {
			ds = append(ds, rds...)
			continue
		}
		lim := p.Settings.Limits.Links
		links, err := format.ParseLinkTableWithin(src.File, data, format.Budget{Left: lim - linksRead, Over: format.OverLimit("links", lim, "limits.links")}, len(p.Items))
		if err != nil {
			ds = append(ds, format.AsDiags(err, src.File)...)
			continue
		}
		linksRead += links.Len()
		if !p.itemsBroken {
			ds = append(ds, p.unknownLinked(links)...)
		}
		p.Links[src.File] = links
	}
	return ds
}

// unknownLinked reports each link that names an id that is not an item,
// looking each distinct id up once (LinkItems).
func (p *Repo) unknownLinked(t *format.LinkTable) format.Diags {
	item := p.LinkItems(t)
	if !slices.Contains(item, -1) {
		return nil
	}
	var ds format.Diags
	for k := range t.Len() {
		for _, id := range [2]int32{t.A[k], t.B[k]} {
			if item[id] < 0 {
				ds.Add(t.Pos(k), "link names unknown item %q", t.IDs[id])
			}
		}
	}
	return ds
}

// LinkItems is the item index of each id of t, -1 for an id that is no
// item, looked up on the first call (by Load, for its check; the
// similarity graph of a links source reads it again).
func (p *Repo) LinkItems(t *format.LinkTable) []int32 {
	if item, ok := p.linkItems[t]; ok {
		return item
	}
	item := make([]int32, len(t.IDs))
	for k, id := range t.IDs {
		item[k] = -1
		if i, ok := p.Index[id]; ok {
			item[k] = int32(i)
		}
	}
	if p.linkItems == nil {
		p.linkItems = map[*format.LinkTable][]int32{}
	}
	p.linkItems[t] = item
	return item
}

func sourceKey(i int, key string) string {
	return "similarity.source[" + strconv.Itoa(i) + "]." + key
}

// ConstraintFiles lists the constraint files of the repository in sorted
// order, as repository-relative slash paths. Links and non-regular files
// are never read: nothing outside the repository is read through them.
func ConstraintFiles(dir string) ([]string, error) {
	files, _, err := constraintEntries(dir)
	return files, err
}

// constraintEntries lists the constraint files, and what lies in the
// constraints folder that looks meant as one but is not read: a link, a
// folder, a hidden .toml file, or a name ending in ".TOML" or the like.
func constraintEntries(dir string) (files []string, skipped format.Diags, err error) {
	folder, err := Resolve(dir, format.ConstraintsDir)
	if err != nil {
		return nil, nil, err
	}
	entries, err := os.ReadDir(folder)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil, nil
	}
	if err != nil {
		return nil, nil, err
	}
	for _, e := range entries {
		name := e.Name()
		rel := format.ConstraintsDir + "/" + name
		at := format.Pos{File: rel}
		tomlish := strings.HasSuffix(strings.ToLower(name), ".toml")
		switch {
		case e.Type().IsRegular() && strings.HasSuffix(name, ".toml") && !strings.HasPrefix(name, "."):
			files = append(files, rel)
		case e.Type()&fs.ModeSymlink != 0:
			skipped.Add(at, "a symbolic link; constraint files must be plain files, so it is not read")
		case e.IsDir():
			skipped.Add(at, "a folder; constraint files must lie directly in %s/, so nothing in it is read", format.ConstraintsDir)
		case !tomlish:
			// Not meant as a constraint file (a README, the .keep
			// placeholder).
		case strings.HasPrefix(name, "."):
			skipped.Add(at, "a hidden file; it is not read (remove the leading \".\" to make it a constraint file)")
		case !e.Type().IsRegular():
			skipped.Add(at, "not a plain file; it is not read")
		default:
			skipped.Add(at, "constraint files end in \".toml\" (lower case); this one is not read")
		}
	}
	sort.Strings(files)
	skipped.Sort()
	return files, skipped, nil
}

func (p *Repo) loadConstraints() format.Diags {
	var ds format.Diags
	recordsRead := 0
	files, skipped, err := constraintEntries(p.Dir)
	p.Warnings = append(p.Warnings, skipped...)
	if err != nil {
		return format.Diags{{Pos: format.Pos{File: format.ConstraintsDir}, Msg: err.Error()}}
	}
	if len(files) > MaxConstraintFiles {
		ds.Add(format.Pos{File: format.ConstraintsDir}, "%d constraint files; the limit is %d", len(files), MaxConstraintFiles)
		return ds
	}
	for _, rel := range files {
		data, rds := p.read(rel, format.MaxSmallFileBytes, format.Pos{File: rel})
		if len(rds) > 0 {
			ds = append(ds, rds...)
			continue
		}
		cf, err := format.ParseConstraints(rel, data)
		if err != nil {
			ds = append(ds, format.AsDiags(err, rel)...)
			continue
		}
		if at, over := p.pastRecordBudget(cf, &recordsRead); over {
			// The records of this file are let go, and no further file is
			// read: what is kept stays inside the budget.
			lim := p.Settings.Limits.Records
			ds.Add(at, "%s", format.OverLimit("constraint records (a shape counts as the triplets it compiles to)", lim, "limits.records"))
			return ds
		}
		ds = append(ds, p.checkRefs(cf)...)
		ds = append(ds, p.shapeProblems(cf)...)
		p.Constraints = append(p.Constraints, cf)
	}
	return ds
}

// pastRecordBudget adds the records of cf to *read and reports where the
// first record past limits.records stands, if one does. A triplet or
// group record counts one; a shape counts the triplets it compiles to
// (at least one), which is what it costs the solver.
func (p *Repo) pastRecordBudget(cf *format.ConstraintFile, read *int) (format.Pos, bool) {
	type cost struct {
		at format.Pos
		n  int
	}
	var costs []cost
	for _, t := range cf.Triplets {
		costs = append(costs, cost{t.Pos, 1})
	}
	for _, g := range cf.Groups {
		costs = append(costs, cost{g.Pos, 1})
	}
	for _, sh := range cf.Shapes {
		n := int64(1)
		if nodes := shape.Nodes(sh.Tree, p.ItemIndex); nodes != nil {
			n = max(n, nodes.TripletCount())
		}
		costs = append(costs, cost{sh.Pos, int(min(n, 1<<40))})
	}
	sort.Slice(costs, func(i, j int) bool { return costs[i].at.Line < costs[j].at.Line })
	lim := p.Settings.Limits.Records
	for _, c := range costs {
		if *read+c.n > lim {
			return c.at, true
		}
		*read += c.n
	}
	return format.Pos{}, false
}

// shapeProblems reports shapes of a constraint file that would compile to
// more than shape.MaxTripletsPerItem triplets per item, at the shape's
// header, before anything is allocated for them.
func (p *Repo) shapeProblems(cf *format.ConstraintFile) format.Diags {
	var ds format.Diags
	for _, s := range cf.Shapes {
		n := shape.Nodes(s.Tree, p.ItemIndex)
		if n == nil {
			continue
		}
		items := int64(len(s.Refs))
		if need, limit := n.TripletCount(), shape.MaxTripletsPerItem*items; need > limit {
			ds.Add(s.Pos, "this shape needs %d triplets to say; the limit is %d for its %d items (%d each): split it into smaller shapes, or write its categories as [[group]] records", need, limit, items, shape.MaxTripletsPerItem)
		}
	}
	return ds
}

// checkRefs reports constraint records that name items the repository
// does not have.
func (p *Repo) checkRefs(cf *format.ConstraintFile) format.Diags {
	var ds format.Diags
	if p.itemsBroken {
		return nil
	}
	check := func(refs []format.Ref) {
		for _, r := range refs {
			if _, ok := p.Index[r.ID]; !ok {
				if ds.Full() {
					ds.Add(r.Pos, "")
					continue
				}
				ds.Add(r.Pos, "unknown item %q%s", r.ID, p.SuggestItem(r.ID))
			}
		}
	}
	for _, t := range cf.Triplets {
		check(t.Refs)
	}
	for _, g := range cf.Groups {
		check(g.Refs)
	}
	for _, s := range cf.Shapes {
		check(s.Refs)
	}
	return ds
}

// SuggestItem offers a did-you-mean for a mistyped item id ("; did you
// mean "x"?", or ""), only for small repositories where scanning every id
// is cheap.
func (p *Repo) SuggestItem(id string) string {
	if len(p.Items) > 20000 {
		return ""
	}
	if s := format.Suggest(id, p.ItemIDs()); s != "" {
		return "; did you mean " + `"` + s + `"?`
	}
	return ""
}

// earlyOutline is the outline as parseOutlineEarly read and parsed it.
type earlyOutline struct {
	done     chan struct{}
	data     []byte
	outline  *format.Outline
	err      error
	warnings format.Diags
}

// parseOutlineEarly reads and parses the outline file on a goroutine of
// its own, ahead of its turn and outside the byte budget; nil when there
// is nothing to read.
func (p *Repo) parseOutlineEarly() *earlyOutline {
	rel := p.Settings.Taxonomy.File
	full, err := Resolve(p.Dir, rel)
	if err != nil {
		return nil
	}
	e := &earlyOutline{done: make(chan struct{})}
	go func() {
		defer close(e.done)
		data, err := format.ReadFileLimited(full, rel, format.MaxOutlineBytes)
		if err != nil {
			return
		}
		e.data = data
		e.outline, e.err = format.ParseOutline(rel, data)
		if e.err == nil {
			e.warnings = format.ConfusableSiblings(rel, e.outline.Root)
		}
	}()
	return e
}

// loadOutline reads and parses the outline; early, when not nil, is the
// parse made ahead of time, used when it read the same bytes.
func (p *Repo) loadOutline(early *earlyOutline) format.Diags {
	if early != nil {
		// Wait for it even when unused: nothing may still be reading
		// once Load has returned.
		<-early.done
	}
	rel := p.Settings.Taxonomy.File
	full, err := Resolve(p.Dir, rel)
	if err != nil {
		return format.Diags{{Pos: p.keyPos("taxonomy.file"), Msg: err.Error()}}
	}
	if _, err := os.Stat(full); errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	data, ds := p.readResolved(full, rel, format.MaxOutlineBytes, p.keyPos("taxonomy.file"))
	if len(ds) > 0 {
		return ds
	}
	if early == nil || early.data == nil || !bytes.Equal(early.data, data) {
		early = &earlyOutline{data: data}
		early.outline, early.err = format.ParseOutline(rel, data)
		if early.err == nil {
			early.warnings = format.ConfusableSiblings(rel, early.outline.Root)
		}
	}
	if early.err != nil {
		return format.AsDiags(early.err, rel)
	}
	p.Outline, p.OutlineText = early.outline, data
	// Look-alike sibling names are no error (a name may mean to be what
	// it looks like), but no reader can tell them apart: check warns,
	// and fails under --strict.
	p.Warnings = append(p.Warnings, early.warnings...)
	return nil
}

// OutlineMembership reports items of the outline that the repository does
// not have, and items the outline does not place. For `check` both mean
// the committed taxonomy is out of date.
func (p *Repo) OutlineMembership() format.Diags {
	if p.Outline == nil {
		return nil
	}
	var ds format.Diags
	rel := p.Settings.Taxonomy.File
	placed := map[string]bool{}
	p.Outline.Root.Walk(func(c *format.Category, _ int) bool {
		for i, id := range c.Items {
			placed[id] = true
			if _, ok := p.Index[id]; !ok {
				line := 0
				if i < len(c.ItemLines) {
					line = c.ItemLines[i]
				}
				at := format.Pos{File: rel, Line: line, Col: 1}
				if ds.Full() { // counted only: no suggestion to look for
					ds.Add(at, "")
					continue
				}
				ds.Add(at, "item %q is not in the items files%s", id, p.SuggestItem(id))
			}
		}
		return true
	})
	for _, it := range p.Items {
		if !placed[it.ID] {
			ds.Add(it.Pos, "item %q is missing from %s; run `ramify solve` to place it", it.ID, rel)
		}
	}
	ds.Sort()
	return ds
}
