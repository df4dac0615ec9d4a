// Package typo finds the known word a mistyped one was meant to be, for the
// "did you mean" of a refused flag or value.
package typo

// Distance is the Levenshtein distance between a and b, by bytes.
func Distance(a, b string) int {
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			sub := prev[j-1]
			if a[i-1] != b[j-1] {
				sub++
			}
			cur[j] = min(sub, prev[j]+1, cur[j-1]+1)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}

// Nearest is the word of words nearest w, if it lies within a quarter of
// w's length in edits (at least one): a slip, not another word (--loud is
// not --log).
func Nearest(w string, words []string) (string, bool) {
	best, dist := "", -1
	for _, c := range words {
		if d := Distance(w, c); dist < 0 || d < dist {
			best, dist = c, d
		}
	}
	return best, dist >= 0 && dist <= max(1, len(w)/4)
}
