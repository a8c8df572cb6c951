package repl

// distance returns the Levenshtein edit distance between a and b.
func distance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
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

// nearest returns the candidate closest to word by edit distance, or ""
// when none is within about a third of the word's length (at least 2
// edits allowed); a candidate that starts with word wins outright.
func nearest(word string, candidates []string) string {
	best, bestD := "", 1<<30
	for _, c := range candidates {
		if len(word) >= 2 && len(c) > len(word) && c[:len(word)] == word {
			return c
		}
		if d := distance(word, c); d < bestD {
			best, bestD = c, d
		}
	}
	limit := max(2, len([]rune(word))/3)
	if bestD > limit {
		return ""
	}
	return best
}
