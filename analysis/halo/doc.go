// Package halo looks for the diffuse maximum an amorphous solid gives in a
// powder pattern: a hump several degrees wide standing clear of a smooth
// background, where a crystal would give sharp peaks.
//
// It is a screen, not a structure analysis: it finds a broad maximum and
// measures its place and width; whether the hump comes from the specimen or
// from an amorphous sample holder is for the caller (and a person) to judge,
// e.g. by the scattering vector of its centre.
package halo
