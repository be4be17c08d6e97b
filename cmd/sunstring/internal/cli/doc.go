// Package cli is sunstring's command tree: one file per command, each built by a newXxxCmd
// constructor. It is the only place that reads flags and files named by the user and the only
// place that decides where outputs go.
package cli
