// Package rtl lays out right-to-left text (Arabic, Hebrew) for a writer that places
// characters left to right and does no shaping, as the PDF writer and the charts do:
// Visual joins Arabic letters through their presentation forms and reverses each
// right-to-left stretch of a line, so that a name in those scripts reads as it should.
//
// It is a small part of what the Unicode Bidirectional Algorithm (UAX #9) and Arabic
// shaping do: one left-to-right line, no embedding levels, no mirrored brackets, and only
// the letters with a presentation form in Unicode's Arabic Presentation Forms-B block
// (letters of other languages written in Arabic script print unjoined).
package rtl
