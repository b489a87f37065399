package naming_test

import (
	"fmt"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/ramify-tax/ramify/solve/naming"
)

func ExampleAssign() {
	// A freshly solved tree: shape and items, no names yet.
	levels := &format.Category{Items: []string{"laser-level", "spirit-level-60"}}
	measuring := &format.Category{Children: []*format.Category{levels}, Items: []string{"tape-measure-8m"}}
	hammers := &format.Category{Items: []string{"claw-hammer", "mallet-rubber"}}
	root := &format.Category{Children: []*format.Category{hammers, measuring}}

	tags := map[string]string{
		"laser-level":     "measure laser level",
		"spirit-level-60": "measure spirit level",
		"tape-measure-8m": "measure tape",
		"claw-hammer":     "hammer striking",
		"mallet-rubber":   "hammer striking rubber",
	}
	words := func(item string) []string { return strings.Fields(tags[item]) }
	groups := []naming.Fixed{{Items: []string{"claw-hammer", "mallet-rubber"}, Name: "Hammers"}}

	counts := naming.Assign(root, nil, groups, words)
	fmt.Print(string(format.FormatTree(root)))
	fmt.Printf("%+v\n", counts)
	// Output:
	// Hammers/
	//   claw-hammer
	//   mallet-rubber
	// ~ measure · level/
	//   ~ laser · spirit/
	//     laser-level
	//     spirit-level-60
	//   tape-measure-8m
	// {Fixed:1 Typed:0 Carried:0 Provisional:2 Suffixed:0}
}
