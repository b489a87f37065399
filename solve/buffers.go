package solve

func growInt32(buf []int32, n int) []int32 {
	if cap(buf) < n {
		return make([]int32, n, n+n/4)
	}
	return buf[:n]
}

func growInt8(buf []int8, n int) []int8 {
	if cap(buf) < n {
		return make([]int8, n, n+n/4)
	}
	return buf[:n]
}

func grow(buf []float64, n int) []float64 {
	if cap(buf) < n {
		return make([]float64, n)
	}
	return buf[:n]
}
