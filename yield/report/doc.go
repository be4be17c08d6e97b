// Package report turns a survey's results into what people read and other tools take: the
// summary.json document (DESIGN.md's output contract), charts drawn with gonum/plot (PNG, and
// SVG on request), the modules GeoJSON and the customer proposal PDF. It returns bytes; the
// command line decides where they go.
package report
