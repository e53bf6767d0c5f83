package scene

import (
	"fmt"
	"strings"
)

// editDistance is the optimal-string-alignment distance between a and b:
// insertions, deletions, substitutions and swaps of two neighbouring
// characters cost one each (Levenshtein's distance by the dynamic programme
// of Wagner and Fischer, JACM 21(1), 1974, with Damerau's transposition,
// CACM 7(3), 1964), so that "stpe" is one slip from "step".
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	d := make([][]int, len(ra)+1)
	for i := range d {
		d[i] = make([]int, len(rb)+1)
		d[i][0] = i
	}
	for j := range d[0] {
		d[0][j] = j
	}
	for i := 1; i <= len(ra); i++ {
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			d[i][j] = min(d[i-1][j]+1, d[i][j-1]+1, d[i-1][j-1]+cost)
			if i > 1 && j > 1 && ra[i-1] == rb[j-2] && ra[i-2] == rb[j-1] {
				d[i][j] = min(d[i][j], d[i-2][j-2]+1)
			}
		}
	}
	return d[len(ra)][len(rb)]
}

func commonPrefix(a, b string) int {
	n := 0
	for n < len(a) && n < len(b) && a[n] == b[n] {
		n++
	}
	return n
}

// Nearest returns the candidate closest to s by edit distance, if it is
// close enough to be a likely slip: at most a third of the longer word's
// letters (and at least one) differ, or half of them when the two share a
// beginning of three letters or more ("bodies" for "body"). Ties go to the
// earlier candidate, so the answer is deterministic.
func Nearest(s string, candidates []string) (string, bool) {
	best, bestD := "", 1<<30
	ls := strings.ToLower(s)
	for _, c := range candidates {
		d := editDistance(ls, strings.ToLower(c))
		if d < bestD {
			best, bestD = c, d
		}
	}
	if best == "" {
		return "", false
	}
	longer := max(len([]rune(s)), len([]rune(best)))
	limit := max(longer/3, 1)
	if commonPrefix(ls, strings.ToLower(best)) >= 3 {
		limit = max(limit, longer/2)
	}
	return best, bestD <= limit
}

// Suggest returns "; did you mean "x"?" for the nearest candidate, or a
// list of the valid names when none is close.
func Suggest(s string, candidates []string) string {
	if c, ok := Nearest(s, candidates); ok {
		return fmt.Sprintf("; did you mean %q?", c)
	}
	if len(candidates) == 0 {
		return ""
	}
	q := make([]string, len(candidates))
	for i, c := range candidates {
		q[i] = fmt.Sprintf("%q", c)
	}
	return "; valid: " + strings.Join(q, ", ")
}
