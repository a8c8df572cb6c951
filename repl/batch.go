package repl

// rowSpec describes how the batch command applies a verb to one CSV row.
type rowSpec struct{}
