package export

import "strings"

// statement is one subject with its predicates, each with one or more
// objects, written as a single Turtle block:
//
//	<subject>
//	    predicate object ;
//	    predicate
//	        object ,
//	        object .
//
// A predicate with several objects puts each on a line of its own, so a
// concept that gains a member changes one line of the export's diff.
type statement struct {
	subject string
	props   []property
}

type property struct {
	predicate string
	objects   []string
}

func (s *statement) add(predicate string, objects ...string) {
	if len(objects) > 0 {
		s.props = append(s.props, property{predicate, objects})
	}
}

func (s *statement) writeTo(b *strings.Builder) {
	b.WriteString(s.subject)
	for i, p := range s.props {
		b.WriteString("\n    ")
		b.WriteString(p.predicate)
		if len(p.objects) == 1 {
			b.WriteByte(' ')
			b.WriteString(p.objects[0])
		} else {
			for j, o := range p.objects {
				b.WriteString("\n        ")
				b.WriteString(o)
				if j < len(p.objects)-1 {
					b.WriteString(" ,")
				}
			}
		}
		if i < len(s.props)-1 {
			b.WriteString(" ;")
		}
	}
	b.WriteString(" .\n")
}
