// Package splitmix holds the SplitMix64 generator's two pieces (Steele,
// Lea & Flood, "Fast splittable pseudorandom number generators",
// OOPSLA 2014): the golden-ratio step Gamma and the finaliser Mix. The
// packages that seed their streams from a number (the committee's
// replicates, the spectral start vector, NN-Descent's per-item draws)
// share this one copy.
package splitmix

// Gamma is the step SplitMix64 adds to its state before each output: the
// odd integer nearest 2⁶⁴/φ.
const Gamma = 0x9e3779b97f4a7c15

// Mix is SplitMix64's finaliser (the variant with shifts 30, 27 and 31):
// a bijection of uint64 under which nearby inputs give unrelated outputs.
func Mix(z uint64) uint64 {
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}
