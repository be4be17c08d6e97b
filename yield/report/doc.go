// Package report turns a survey's results into what people read and other tools take: the
// summary.json document (the contract in README.md, Outputs), charts drawn with gonum/plot (PNG, and
// SVG on request), the modules GeoJSON and two PDFs: the proposal for the homeowner (Proposal.PDF)
// and the technical sheet for the installer and the surveyor's file (Proposal.TechnicalPDF). It
// returns bytes; the command line decides where they go.
//
// The loss breakdown is shown by where the energy goes (GroupLosses), and the shade loss as one
// figure with its three parts in the same words everywhere (ShadeSentence). Text the main
// typeface lacks is drawn in the fallback faces of package fonts, in the PDFs (pdftext.go)
// and in the charts (charttext.go); only what no face has prints as a mark (Printable).
//
// It applies no published model of its own: every figure it shows comes from the packages
// that compute it (the performance ratio after IEC 61724-1, from package yield).
package report
