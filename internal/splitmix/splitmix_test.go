package splitmix

import "testing"

// TestSequence checks the first outputs of SplitMix64 from state 0: the
// state steps by Gamma and each output is Mix of the new state.
func TestSequence(t *testing.T) {
	want := []uint64{0xe220a8397b1dcdaf, 0x6e789e6aa1b965f4, 0x06c45d188009454f, 0xf88bb8a8724c81ec}
	var state uint64
	for i, w := range want {
		state += Gamma
		if got := Mix(state); got != w {
			t.Errorf("output %d = %#016x, want %#016x", i, got, w)
		}
	}
}

// TestMixIsOneToOne checks that distinct nearby inputs never collide.
func TestMixIsOneToOne(t *testing.T) {
	seen := make(map[uint64]uint64, 1<<16)
	for x := uint64(0); x < 1<<16; x++ {
		m := Mix(x)
		if prev, ok := seen[m]; ok {
			t.Fatalf("Mix(%d) = Mix(%d) = %#x", x, prev, m)
		}
		seen[m] = x
	}
}
