// Package query turns the filters people type, as command-line flags or as
// URL query keys, into a meltbook.MeltFilter, and turns the melts found
// into the rows that the find command and the web's /api/find both print.
//
// One vocabulary serves both: the flag --ea 1.7:1.8 and the query key
// ea=1.7:1.8 mean the same, so a search can move between the terminal and
// the browser unchanged. Fields lists the names with their value syntax.
//
// Parse is pure: it reads no files and no clock. Dates without a zone are
// read in the location the caller gives.
package query
