// Package fonts holds the typefaces the reports fall back on for characters their main
// typeface (Liberation Sans) lacks: other scripts in a site's, customer's or face's name,
// and pictographs. Each face says which characters it draws; the PDF writer picks, per
// character, the first face of Chain that has it, and draws a pictograph outside the
// Basic Multilingual Plane from Pictographs as an outline.
//
// The faces and their licences are listed in the README's Sources.
package fonts
