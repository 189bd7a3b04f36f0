// Package site renders an evaluated [library.Library] as a static website: a datasheet
// page per material, a library index with a sortable table and a scatter
// chart, category and tag listings, comparison pages, a review page of the
// claims the spectra do not support or cannot check, catalog.json and the
// downloads of every material.
//
// # Output
//
//	index.html                            library index; beside it materials.csv, its table
//	m/SLUG/index.html                     datasheet; beside it spectrum.csv, figures.json, figures.csv, claims.json, source.md
//	materials/by-category/CAT/index.html  materials of one category, with materials.csv
//	materials/by-tag/TAG/index.html       materials with one tag, with materials.csv
//	compare/SLUG/index.html               comparison pages
//	review/index.html                     claims not supported or not checkable
//	catalog.json                          every material's metadata, figures and claims with verdicts
//	search.js                             the search index, loaded by site.js when the search box is used
//	assets/style.css, assets/site.js
//
// Links are relative and name index.html, so the site works from file://
// and under any base path. Nothing is loaded from elsewhere.
//
// # Determinism
//
// [Render] writes the same bytes for the same library: no clock, no random
// order (maps are sorted, materials keep library order). Materials are
// evaluated by [evaluate.Library] in parallel; each material's page and
// downloads are written by the worker that evaluated it, as soon as it is
// done, and its spectra dropped. The index, listings, review page and
// catalog.json are built afterwards from the materials' summaries, in
// library order. The site computes nothing itself: figures, verdicts and
// resolved optics come from the evaluation step.
//
// # Safety
//
// Every string from content is escaped by html/template or, inside charts,
// by the chart renderer. Raw HTML in Markdown bodies is dropped unless the
// library config sets allow_html.
package site
