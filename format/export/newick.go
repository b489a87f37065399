package export

import (
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/ramify-tax/ramify/format"
)

// NewickOptions say how the Newick tree is labelled.
type NewickOptions struct {
	// RootLabel names the root node; the root is unlabelled when empty.
	RootLabel string
}

// Newick writes the taxonomy as one Newick tree: items are the leaves,
// labelled with their ids, and each category is the internal node above
// its members, labelled with its name as the outline shows it (a
// provisional name keeps its "~ " marker). No branch lengths are written:
// a taxonomy has levels, not distances. The text ends in ";" and a line
// feed.
//
// A label is written bare when it only holds ASCII letters, digits, "."
// and "-"; any other label is put in single quotes, with a quote inside
// doubled, as the Newick convention has it. "_" is quoted too, because
// readers turn a bare underscore into a space, and so is a label that
// reads as a number, which readers may take for a support value.
func Newick(w io.Writer, root *format.Category, opt NewickOptions) error {
	tree := sortedCopy(root)
	var b strings.Builder
	if len(tree.Children) > 0 || len(tree.Items) > 0 {
		if err := writeNewickNode(&b, tree); err != nil {
			return err
		}
	}
	if opt.RootLabel != "" {
		b.WriteString(newickLabel(opt.RootLabel))
	}
	b.WriteString(";\n")
	_, err := io.WriteString(w, b.String())
	return err
}

// errEmptyCategory: a category with no members has no Newick form that
// readers agree on (it would read back as a leaf, like an item).
var errEmptyCategory = errors.New("is empty; Newick cannot hold an empty category")

// writeNewickNode writes "(members)" for c; the caller adds c's label.
// Recursion depth is the tree's depth, which outlines bound.
func writeNewickNode(b *strings.Builder, c *format.Category) error {
	b.WriteByte('(')
	first := true
	sep := func() {
		if !first {
			b.WriteByte(',')
		}
		first = false
	}
	for _, ch := range c.Children {
		sep()
		if len(ch.Children) == 0 && len(ch.Items) == 0 {
			return fmt.Errorf("category %q %w", ch.DisplayName(), errEmptyCategory)
		}
		if err := writeNewickNode(b, ch); err != nil {
			return err
		}
		b.WriteString(newickLabel(ch.DisplayName()))
	}
	for _, id := range c.Items {
		sep()
		b.WriteString(newickLabel(id))
	}
	b.WriteByte(')')
	return nil
}

// newickLabel writes a label bare when that is safe, else quoted.
func newickLabel(s string) string {
	if _, err := strconv.ParseFloat(s, 64); s != "" && newickBare(s) && err != nil {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", "''") + "'"
}

func newickBare(s string) bool {
	for i := 0; i < len(s); i++ {
		c := s[i]
		if !(c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '.' || c == '-') {
			return false
		}
	}
	return true
}
