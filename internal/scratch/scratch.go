package scratch

// Reuse returns s emptied, with its whole capacity set to the zero value,
// so that the buffer reads as freshly made memory wherever it grows again
// (code that reslices into its capacity, or marks entries by a stamp,
// then finds what a new buffer would hold).
func Reuse[T any](s []T) []T {
	s = s[:cap(s)]
	clear(s)
	return s[:0]
}
