// Package solve builds the taxonomy tree: the hierarchy that fits the
// similarity graph best under Dasgupta's cost among the trees that honour
// every editorial constraint, and the average-linkage baseline.
//
// docs/methods.md describes the methods and their papers; each algorithm's
// doc comment names the paper it follows.
//
// # Explicit float64 conversions around products
//
// Throughout the package, products that are then added to something are
// written float64(x*y) + z rather than x*y + z. This is deliberate. The Go
// specification ("Floating-point operators") lets an implementation fuse
// x*y + z into one fused multiply-add, which rounds once instead of twice,
// and the compiler does so on some architectures (arm64, ppc64le, s390x)
// but not on amd64. An explicit conversion of the product to float64 forces
// it to be rounded on its own, which forbids the fusion. Costs, sweep
// scores and eigenvectors therefore come out bit-identical on every
// architecture, and so do the trees and files that depend on them. The
// conversions look redundant; do not remove them.
package solve
