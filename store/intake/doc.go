// Package intake brings diffraction scans into the notebook: it reads a scan
// file, finds and fits its peaks (analysis/peaks), indexes them
// (analysis/indexing), weighs each phase found against what the notebook
// knows of the sample (analysis/verdict) and stores the scan, its peaks, its
// indexing and the automatic outcome proposals in one transaction
// (store.AddScan). Reindex runs the analysis again on a stored scan, as a
// new indexing version.
//
// # What is proposed
//
// Every phase the indexing reports beat chance (its Options.MaxChance,
// 1 % by default) and becomes one proposal, whatever its confidence: the
// evidence text says what agreed and what did not. When no phase beats
// chance nothing crystalline is proposed. A pattern whose specimen peaks,
// if any, carry less than a tenth of the integrated intensity of a diffuse
// halo (analysis/halo) is weighed as amorphous, and proposed only when the
// halo lies where metallic glasses scatter (analysis/verdict); otherwise
// the result only notes the hump.
//
// The evidence beside the pattern:
//   - symmetry: the folds of every symmetry observation on the sample;
//   - e/a: the melt's nominal composition under Raynor valences against the
//     family's window (analysis/descriptor);
//   - neighbours: samples of other melts whose nominal composition lies
//     within Options.NeighbourDistance (composition.Distance, 0.02 by
//     default, about 1.4 at.% moved between two elements) and that carry a
//     standing outcome (a person's, or a confirmed proposal).
//
// # Radiation
//
// The radiation is the one given in Options (radiation.ParseRadiation
// syntax), else the one the file states, else Cu Kα1/Kα2 with Kα2 in the
// scan, recorded as assumed and said in the result's notes; Reindex with a
// radiation corrects the scan's record, with the reason in the history.
//
// # Re-indexing
//
// Reindex keeps every earlier indexing and its proposals. Proposals still
// awaiting a decision are rejected with the reason "superseded by
// re-indexing"; a person's confirmation or rejection stands.
//
// # Speed
//
// Indexing compares each fit with random peak lists, whose scores cost from a
// fraction of a second to seconds to compute for a new peak count and 2θ
// range. LoadCalibration and SaveCalibration keep them in a file between
// runs (DefaultCalibrationPath), so that repeated imports stay fast.
package intake
