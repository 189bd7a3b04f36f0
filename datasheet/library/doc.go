// Package library reads and checks a library folder: a site configuration
// (skysheet.yaml), Markdown files with YAML front matter under content/, and
// the spectra files they name. [Load] reads the config and front matter,
// works out each material's conditions (the library's, overridden by the
// material's own) and checks that its spectra files exist; it computes no
// figures. [Library.ReadSample] reads one material's spectra when it is
// evaluated (package datasheet/evaluate), so that a library of thousands
// of materials is never held in memory at once.
//
// # Layout
//
//	skysheet.yaml          site config: title, site_address, description, allow_html, conditions, lab, publisher
//	content/**/*.md        one material (or comparison page) per file: front matter, then Markdown
//	content/**/<spectra>   spectra files named in the front matter, relative to the .md file
//	templates/*.html       optional template overrides (read by the site package, not here)
//
// # Strictness
//
// Config and front matter are parsed strictly: an unknown or repeated key, a
// value of the wrong type, a missing required key or a path that leaves the
// library is an [*Error] naming the file, line and column, and for an
// unknown key the nearest known key. [Load] collects the errors of every
// file and returns them together as [Errors].
//
// # Paths
//
// Load reads only through the [fs.FS] it is given, which is rooted at the
// library folder. Spectra paths are slash-separated and relative to the
// Markdown file; absolute paths, backslashes and paths that climb out of the
// library with ".." are rejected. Symbolic links that leave the folder must
// be refused by the file system the caller builds (for example with
// [os.Root]).
package library
