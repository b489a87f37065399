package rdf

import "strings"

// iriParts are the five components of RFC 3986 section 3; has* say
// whether the optional ones are present (an empty query differs from
// none).
type iriParts struct {
	scheme, authority, path, query, fragment string
	hasAuthority, hasQuery, hasFragment      bool
}

// splitIRI splits an IRI reference with the regular expression of RFC
// 3986 appendix B, by hand.
func splitIRI(s string) iriParts {
	var p iriParts
	if i := strings.IndexAny(s, ":/?#"); i > 0 && s[i] == ':' && validScheme(s[:i]) {
		p.scheme, s = s[:i], s[i+1:]
	}
	if strings.HasPrefix(s, "//") {
		s = s[2:]
		i := strings.IndexAny(s, "/?#")
		if i < 0 {
			i = len(s)
		}
		p.authority, p.hasAuthority, s = s[:i], true, s[i:]
	}
	if i := strings.IndexByte(s, '#'); i >= 0 {
		p.fragment, p.hasFragment, s = s[i+1:], true, s[:i]
	}
	if i := strings.IndexByte(s, '?'); i >= 0 {
		p.query, p.hasQuery, s = s[i+1:], true, s[:i]
	}
	p.path = s
	return p
}

func validScheme(s string) bool {
	for i := 0; i < len(s); i++ {
		c := s[i]
		alpha := c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z'
		if !alpha && (i == 0 || !(c >= '0' && c <= '9' || c == '+' || c == '-' || c == '.')) {
			return false
		}
	}
	return s != ""
}

func (p iriParts) String() string {
	var b strings.Builder
	if p.scheme != "" {
		b.WriteString(p.scheme + ":")
	}
	if p.hasAuthority {
		b.WriteString("//" + p.authority)
	}
	b.WriteString(p.path)
	if p.hasQuery {
		b.WriteString("?" + p.query)
	}
	if p.hasFragment {
		b.WriteString("#" + p.fragment)
	}
	return b.String()
}

// isAbsoluteIRI reports whether ref has a scheme.
func isAbsoluteIRI(ref string) bool { return splitIRI(ref).scheme != "" }

// resolveIRI resolves ref against base as RFC 3986 section 5.2.2 says
// (the strict parser: a scheme in ref makes it absolute). base must be
// absolute; when it is empty, ref is returned as it is.
func resolveIRI(base, ref string) string {
	if base == "" {
		return ref
	}
	r, b := splitIRI(ref), splitIRI(base)
	var t iriParts
	switch {
	case r.scheme != "":
		t = r
		t.path = removeDotSegments(r.path)
	case r.hasAuthority:
		t = r
		t.scheme = b.scheme
		t.path = removeDotSegments(r.path)
	default:
		t.scheme, t.authority, t.hasAuthority = b.scheme, b.authority, b.hasAuthority
		switch {
		case r.path == "":
			t.path = b.path
			t.query, t.hasQuery = b.query, b.hasQuery
			if r.hasQuery {
				t.query, t.hasQuery = r.query, true
			}
		case strings.HasPrefix(r.path, "/"):
			t.path = removeDotSegments(r.path)
			t.query, t.hasQuery = r.query, r.hasQuery
		default:
			t.path = removeDotSegments(mergePaths(b, r.path))
			t.query, t.hasQuery = r.query, r.hasQuery
		}
	}
	t.fragment, t.hasFragment = r.fragment, r.hasFragment
	return t.String()
}

// mergePaths is RFC 3986 section 5.2.3.
func mergePaths(base iriParts, ref string) string {
	if base.hasAuthority && base.path == "" {
		return "/" + ref
	}
	if i := strings.LastIndexByte(base.path, '/'); i >= 0 {
		return base.path[:i+1] + ref
	}
	return ref
}

// removeDotSegments is RFC 3986 section 5.2.4.
func removeDotSegments(in string) string {
	var out []string // output segments, each with its leading "/" if any
	for in != "" {
		switch {
		case strings.HasPrefix(in, "../"):
			in = in[3:]
		case strings.HasPrefix(in, "./"):
			in = in[2:]
		case strings.HasPrefix(in, "/./"):
			in = in[2:]
		case in == "/.":
			in = "/"
		case strings.HasPrefix(in, "/../"):
			in = in[3:]
			if len(out) > 0 {
				out = out[:len(out)-1]
			}
		case in == "/..":
			in = "/"
			if len(out) > 0 {
				out = out[:len(out)-1]
			}
		case in == "." || in == "..":
			in = ""
		default:
			start := 0
			if in[0] == '/' {
				start = 1
			}
			i := strings.IndexByte(in[start:], '/')
			if i < 0 {
				i = len(in)
			} else {
				i += start
			}
			out = append(out, in[:i])
			in = in[i:]
		}
	}
	return strings.Join(out, "")
}
