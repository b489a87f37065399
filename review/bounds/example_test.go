package bounds_test

import (
	"fmt"

	"github.com/ramify-tax/ramify/review/bounds"
)

func ExampleClopperPearson() {
	// 2 rejected audit packets out of 30.
	lo, hi := bounds.ClopperPearson(2, 30, 0.95)
	fmt.Printf("reject rate 95%% interval [%.4f, %.4f]\n", lo, hi)
	fmt.Printf("one-sided 95%% upper bound %.4f\n", bounds.ClopperPearsonUpper(2, 30, 0.95))
	// Output:
	// reject rate 95% interval [0.0082, 0.2207]
	// one-sided 95% upper bound 0.1953
}
