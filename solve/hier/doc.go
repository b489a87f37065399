// Package hier is the rooted tree that solve, diff, review and the
// command layer share, the way one token package serves a scanner, a
// parser and a printer: the tree over leaves 0..N-1 (Tree), its
// depth-first index with each node's range of leaf positions (Index), the
// constant-time lowest common ancestor over that order (LCAIndex), and
// the two ways a nested category tree becomes a Tree (CollapsingChains,
// KeepingChains) and the way back (Unfold).
//
// It imports nothing outside the standard library, so every layer above
// it may use it without pulling in the solver.
package hier
