package msg

import "strings"

// MaxCompared bounds the length, in runes, of the names [Distance] compares.
const MaxCompared = 256

// Nearest returns the name in names closest to s by edit distance (see
// [Distance]; case is ignored) and whether it is close enough to suggest:
// at most max(2, len(s)/3) edits away, s's length counted in runes. Ties
// go to the name listed first. With no names it returns "", false.
func Nearest(s string, names []string) (string, bool) {
	best, bestD := "", -1
	ls := strings.ToLower(s)
	for _, n := range names {
		if d := Distance(ls, strings.ToLower(n)); bestD < 0 || d < bestD {
			best, bestD = n, d
		}
	}
	return best, bestD >= 0 && bestD <= max(2, len([]rune(s))/3)
}

// Distance returns the Levenshtein distance between a and b: the fewest
// insertions, deletions and substitutions of runes that turn a into b.
// Names longer than [MaxCompared] runes are near nothing: the result is
// then an upper bound, so that a 10 MB key costs no quadratic time.
func Distance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	if len(ra) > MaxCompared || len(rb) > MaxCompared {
		return max(len(ra), len(rb))
	}
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}
