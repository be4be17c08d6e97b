// Package report turns a survey's results into what people read and other tools take: the
// summary.json document (the contract in README.md, Outputs), charts drawn with gonum/plot (PNG, and
// SVG on request), the modules GeoJSON and the customer proposal PDF. It returns bytes; the
// command line decides where they go.
//
// It applies no published model of its own: every figure it shows comes from the packages
// that compute it (the performance ratio after IEC 61724-1, from package yield).
package report
