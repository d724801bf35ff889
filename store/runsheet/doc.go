// Package runsheet reads a group's spreadsheet of melt-spinning runs, saved
// as CSV, into notebook values: one melt per row with its arc-melting,
// melt-spinning and anneal steps and the phases found, or the reasons the
// row cannot be taken.
//
// # Columns
//
// Each column heading is compared with the headings every field knows
// (Fields), ignoring case, spaces, underscores, hyphens and dots. A unit
// may be written in the heading, in brackets ("Thickness (µm)",
// "speed [m/s]") or as its last word ("thickness_um"); it applies to the
// plain numbers of that column, and a cell's own unit ("35 um") wins over
// it. A number with neither is refused: a unit is never guessed. Options.Map
// assigns a column by hand (a heading or column number to a field, with an
// optional unit, or "-" to leave it out) and Options.Fill gives a value to
// rows whose cell is empty or whose sheet has no such column. Columns no
// field knows are left out and listed. Two columns for one field, and a
// heading unit that does not fit its field, stop the whole sheet.
//
// # Messy sheets
//
// Read accepts UTF-8 with or without a byte-order mark, UTF-16 with one, and
// otherwise Windows-1252; CRLF line ends; comma, semicolon or tab
// separators, detected as the one that splits the first lines most evenly.
// In semicolon and tab sheets a decimal comma is read as a point; in comma
// sheets a comma inside a number is refused, as it could be a thousands
// separator. Lines above the heading row (the first row with a column for
// the composition) are skipped and listed; blank rows are skipped; cells
// beyond the last heading are reported, not read. Cells holding "-", "n/a"
// or "?" count as empty.
//
// # Dates
//
// ISO dates (2026-03-14, 2026-03-14 09:30, RFC 3339) are read as written;
// dotted dates (14.03.2026) are day first, as everywhere they are written
// so; dates with an English month name (14 Mar 2026, 14-Mar-26) are
// unambiguous. A date with slashes or dashes and the year last (03/04/2026)
// is read day/month or month/day as Options.Dates says; by default the
// order is the one the sheet's other dates prove (a number above 12 can
// only be a day), and when they prove none, or contradict each other, a
// date that could be read either way is refused rather than guessed.
// Two-digit years are 2000-2099, reported. Dates without a zone are in
// Options.Location.
//
// # Outcomes
//
// The outcome cell is read loosely: parts joined by "+", "&", ";", "and" or
// "with" are separate phases; each may carry a percentage (its rough
// fraction) and a "?" or "maybe" (kept as a tentative outcome whose
// evidence starts with Tentative, without a fraction). "i", "i-phase",
// "IQC", "icosahedral" (with F, P, fci or sci for the lattice) are
// icosahedral; "QC" and "quasicrystal" are read as icosahedral and reported
// as a guess, since a decagonal phase is a quasicrystal too; "d-phase" and
// "decagonal" are decagonal; "approximant 1/1" or a bare order "2/1" is a
// cubic approximant (an approximant without order is refused); "α-AlMnSi"
// is the 1/1 approximant; "amorphous" and "glassy" are amorphous; a Greek
// letter, written or spelled ("λ", "beta"), a formula ("Al13Fe4"), a
// structure type ("B2") or a one-letter phase ("H phase") names a
// crystalline phase. "none", "-", "no ribbon" record no phase. Anything else
// refuses the row. Every outcome's evidence quotes the cell and its line.
//
// # Anneals
//
// An anneal cell such as "800 °C 4 h", "800C/4h WQ" or "4 h at 650 °C in
// vacuum, furnace cool" gives one anneal: temperature and time are
// required, quench and cool words become its cooling, other words its
// atmosphere; "none" or "as spun" mean no anneal. A sheet row describes one
// piece of ribbon, so the anneal is recorded as a further step of the
// melt's own sample and the outcome is that sample's.
//
// # Cooling rate
//
// A melt-spinning step with a ribbon thickness gets the cooling-rate
// estimate of analysis/cooling, with the default interface coefficient, the
// melt temperature given (else 1200 °C, assumed), the wheel at 20 °C and
// the alloy's properties from its elements; the step's cooling-regime text
// says which were assumed.
package runsheet
