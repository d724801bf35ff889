// Package composition does alloy composition arithmetic: parsing the
// notations metallurgists write (at% formulas, fractions, balance notation,
// weight-percent forms, nested groups), normalising, converting between
// atomic and weight fractions, and formatting back.
//
// # Notations read by Parse
//
// Element symbols are case-sensitive ("Co" is cobalt; "CO" is carbon and
// oxygen). Spaces, tabs and line breaks may stand between any two tokens.
// Amounts are unsigned decimals with a decimal point: 63, 24.5, 0.63, .5.
//
// Formula: each element followed by its amount; an element with no
// amount counts 1, as in chemistry.
//
//	Al63Cu25Fe12         Al 0.63, Cu 0.25, Fe 0.12
//	Al0.63Cu0.25Fe0.12   the same, written as fractions
//	Al2Cu                Al 2/3, Cu 1/3 (formula units)
//	AlCu                 Al 1/2, Cu 1/2
//
// Balance: the first element has no amount and takes what the others
// leave of 100; every other element follows a dash ("-", or the hyphen,
// en dash or minus sign a word processor puts in its place) with its
// amount before it. The amounts are always read as percentages, so the
// written total is 100.
//
//	Al-25Cu-12Fe         Al 63, Cu 25, Fe 12 (percent)
//	Al-24.5Cu-12.3Fe     Al 63.2, Cu 24.5, Fe 12.3
//
// A balance of zero or less is an error naming the balance element.
//
// Groups: a parenthesised list is a mixture. Its inner amounts are
// normalised to sum 1, then multiplied by the group's amount (1 when none
// is written). A group may stand wherever an element may, in either
// notation, and groups nest up to 16 deep; the inside of a group may
// itself be written in balance notation.
//
//	(Al0.7Pd0.2Mn0.1)99B1        Al 69.3, Pd 19.8, Mn 9.9, B 1
//	((Al1Cu1)80Fe20)90Ni10       Al 36, Cu 36, Fe 18, Ni 10
//	(Al-20Pd)-10Mn               Al 72, Pd 18, Mn 10
//	Al-10(Cu1Fe1)                Al 90, Cu 5, Fe 5
//
// Groups are mixtures, not chemical repeat units: Al(Cu2Fe)3 is one part
// Al and three parts of a 2:1 Cu-Fe mixture (Al 1/4, Cu 1/2, Fe 1/4),
// not Al1Cu6Fe3.
//
// Units: an optional suffix after the whole expression says the basis:
// "at%" or "at.%" for atomic, "wt%", "wt.%" or "mass%" for weight. A space
// before the suffix is optional, but needed after a one-letter symbol
// whose letter plus "a" or "m" is another symbol ("C at%", not "Cat%",
// which reads as calcium). Without a suffix the basis is atomic, or the
// one given in Options. Weight amounts are converted to atomic fractions
// with the standard atomic weights of package element.
//
// # Totals
//
// Amounts are always normalised. How the written total is read decides
// the warning given when it is off:
//
//	total ≤ 1.5          fractions    warned when |total − 1| > 0.005
//	total ≥ 50           percent      warned when |total − 100| > 0.5
//	1.5 < total < 50     proportions  (Al2Cu, Al13Fe4) warned only when an
//	                                  amount is not a whole number
//
// The same rule applies to the inside of each group. Repeated elements
// are added at the first position with a warning when written twice in
// the same list (across groups they add silently, since that is what a
// group is for). Zero amounts are dropped with a warning. Two one-letter
// symbols that would be an element in another case ("CU", read as C then
// U) draw a warning.
//
// # Errors
//
// Every error is a *ParseError carrying the input, the byte offset where
// the trouble was found and what was expected there.
package composition
