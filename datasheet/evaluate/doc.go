// Package evaluate is the step between reading a library and publishing
// it: for each material of a [library.Library] it reads the spectrum files
// (through [library.Library.ReadSample]), resolves R, T and A once,
// computes the figures under the material's conditions and judges its
// claims. Everything a datasheet page, catalog.json and "skysheet review"
// need comes from here; the loader only reads files and the site only
// renders.
//
// # Streaming
//
// [Library] evaluates materials with a bounded pool of workers and hands
// each result to a callback in the worker that made it, so that a page
// can be written at once and the material's spectra dropped. It keeps only
// a [Summary] per material (figures, verdicts, inputs) for the index, the
// catalog and the review, returned in library order whatever the order
// in which workers finish. [All] keeps every result whole, for tests and
// small uses; [Sample] evaluates one sample outside a library (the
// figures command).
//
// # Errors
//
// A material that cannot be evaluated gives a [library.Error] at the
// front-matter entry naming the file at fault; the errors of every
// material are returned together, in library order, as [library.Errors].
package evaluate
