// Package meltbook holds the notebook's domain types: melts, samples,
// process steps, measurements, phase outcomes, notes and the history of
// every change, with their validation and the project's error type.
//
// It imports nothing else of meltbook's; store, analysis and web depend on
// it, never the other way round.
package meltbook
