// Package msg holds the wording shared by every reader's and every verb's
// messages: values from input files are cut to a readable length before they
// are quoted ([Quote], [Cut]), so that a 10 MB cell does not put 10 MB on a
// terminal, and an unknown name gets the nearest known one ([Nearest]) for
// the "did you mean" of an error: an unknown front-matter key, a figure a
// claim misspells, a comparison's slug, a spectrum file that is not there.
package msg
