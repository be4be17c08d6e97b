// Package bigmem makes the large slices of numbers a year of curves is kept in (tens to
// hundreds of megabytes) so that they cost few page faults: each first write to a page of
// fresh memory traps into the kernel, and on a large roof the faults of 4 KiB pages add up to
// seconds. Where the system backs memory with 2 MiB pages on request (Linux with transparent
// huge pages set to "madvise", the default of many distributions, or "always"), Make aligns
// a slice to them and asks for them: one fault per 2 MiB instead of 512. Elsewhere it is
// make.
package bigmem
