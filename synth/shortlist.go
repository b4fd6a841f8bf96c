package synth

import "slices"

// shortlist keeps the best n candidates, best first, one per combination
// of values, leaving out the combinations the walk has measured (w.seen).
// A candidate's key is computed only when it would enter the list, so that
// ranking a million predictions costs little more than judging them.
type shortlist struct {
	w    *walker
	n    int
	c    []candidate
	keys map[string]bool
}

func newShortlist(w *walker, n int) *shortlist {
	return &shortlist{w: w, n: n, keys: map[string]bool{}}
}

// admits reports whether c would rank among the best n.
func (s *shortlist) admits(c *candidate) bool {
	return len(s.c) < s.n || len(s.c) > 0 && s.w.better(c, &s.c[len(s.c)-1])
}

// add puts c in the list when it ranks among the best n and its values
// are neither measured nor listed with a better standing. c.vals is kept,
// not copied.
func (s *shortlist) add(c candidate) {
	if !s.admits(&c) {
		return
	}
	if c.key == "" {
		c.key = key(c.vals)
	}
	if s.w.seen[c.key] {
		return
	}
	if s.keys[c.key] {
		i := slices.IndexFunc(s.c, func(t candidate) bool { return t.key == c.key })
		if !s.w.better(&c, &s.c[i]) {
			return
		}
		s.c = slices.Delete(s.c, i, i+1)
	}
	s.c = insertSorted(s.w, s.c, c, s.n+1)
	s.keys[c.key] = true
	if len(s.c) > s.n {
		delete(s.keys, s.c[s.n].key)
		s.c = s.c[:s.n]
	}
}
