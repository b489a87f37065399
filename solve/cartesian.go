package solve

// treeFromGaps turns a leaf order and the depths of the nodes owning each
// gap (gapDepth[g] for the gap before order[g]) into the binary tree whose
// splits they record: the Cartesian tree of the gap depths.
func treeFromGaps(n int, order, gapDepth []int32) *Tree {
	t := NewTree(n)
	if n == 1 {
		return t
	}
	type pending struct {
		depth int32
		left  int32
	}
	stack := make([]pending, 0, 64)
	cur := order[0]
	for g := 1; g < n; g++ {
		d := gapDepth[g]
		for len(stack) > 0 && stack[len(stack)-1].depth > d {
			cur = t.Add(stack[len(stack)-1].left, cur)
			stack = stack[:len(stack)-1]
		}
		stack = append(stack, pending{d, cur})
		cur = order[g]
	}
	for len(stack) > 0 {
		cur = t.Add(stack[len(stack)-1].left, cur)
		stack = stack[:len(stack)-1]
	}
	t.Root = cur
	return t
}
