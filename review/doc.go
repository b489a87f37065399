// Package review is the review loop: a committee of trees solved on
// perturbed similarity graphs says how firmly the data and the recorded
// decisions fix each category (support) and each item; review packets are
// drawn where the committee disagrees most, plus uniformly random audit
// packets; answered packets become shape constraints and the audit log,
// from which the reject rate is estimated with its exact interval
// (package bounds); and hand edits of the outline become a few
// triplet records per moved item.
//
// The package works on item indices, solver trees and category trees; the
// command layer reads and writes the files.
package review
