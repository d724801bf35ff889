// Package quantity reads the numbers-with-units that people type at the
// bench ("35um", "10 g", "1250 °C", "40 kPa", "25 m/s", "1e5 W/m2K",
// "99.95%") into SI values, and formats SI values back in a unit of the
// user's choice.
//
// Every Parse call names the dimension it expects, so "35 m" is rejected
// where a mass is wanted, and the error lists the units that would be
// accepted. Temperatures are returned in kelvin whichever scale was typed.
// Wheel rotation rates in rpm become surface speeds only together with a
// wheel diameter (see SurfaceSpeed).
package quantity
