// Package templates holds the default page templates, stylesheet and script
// of the library site. A library may override any file, or any named block,
// with files of the same kind in its own templates/ folder.
//
// # Templates
//
// The *.html files are html/template sources parsed together. Each page is
// one named template: "index", "datasheet", "listing", "compare",
// "review" and "weather" (a material's figures over a weather series). They share "top" and "bottom" (layout.html), which in turn call
// the blocks "head-extra", "site-header" and "site-footer", and the pieces
// "verdict", "claim-detail" and "pitfall" that show a judged claim, and
// "note-ref", a link from a table heading to the note that explains it. A file in the library's
// templates/ folder is parsed after the defaults, so a {{define}} in it
// replaces the default of that name; a file with a default's name (say
// datasheet.html) replaces the templates that file defines.
//
// style.css and site.js are copied to assets/; a library file of the same
// name replaces them.
package templates

import "embed"

// FS holds the default templates (*.html), the stylesheet and the script.
//
//go:embed *.html *.css *.js
var FS embed.FS
