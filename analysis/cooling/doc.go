// Package cooling estimates the cooling rate of a melt-spun ribbon (or any
// thin casting chilled from one side) from its thickness, the melt and
// wheel temperatures, the interface heat-transfer coefficient and the
// alloy's density, specific heat and thermal conductivity.
//
// The estimate is Newtonian (interface-controlled) when the Biot number is
// small, and a conduction-limited scaling otherwise; the result always
// says which applied and lists every assumption, because an estimate of
// this kind is only as good as the heat-transfer coefficient put into it.
package cooling
