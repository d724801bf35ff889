// Package composition does alloy composition arithmetic: parsing the
// notations metallurgists write (at% formulas, fractions, balance notation,
// weight-percent forms, nested groups), normalising, converting between
// atomic and weight fractions, and formatting back.
package composition
