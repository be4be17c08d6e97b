// Package finding is the vocabulary every check of a survey speaks: a Finding says how much a
// thing matters (Severity), where it is (the file and the feature or key), what is wrong and
// what to do.
//
// Three severities, and what each one does:
//
//   - Fail: the input cannot give a sound proposal; `check` and `survey` stop with exit
//     status 2 (List.Err returns an error whose BadInput reports true).
//   - Warning: the survey runs, but a person must look before the proposal goes out (a
//     chimney hidden below its roof, a face far darker than the best one, heavy clipping).
//   - Info: worth knowing, nothing to fix (a small overlap trimmed, a number for the record).
//
// Packages that find things (geo, yield/weather, yield/electric, the survey pipeline) either
// return Findings directly or plain strings that their caller files under one severity; the
// severity words are the same everywhere they are printed: as the first word of each line in
// `check`, and as "severity" in summary.json.
package finding
