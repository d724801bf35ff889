package element

// table is a placeholder with a few elements; the full Z = 1-94 table with
// its sources replaces it.
var table = []Element{
	{Z: 13, Symbol: "Al", Name: "aluminium", AtomicWeight: 26.981538, Electronegativity: 1.61, MetallicRadiusCN12: 1.432, ValenceElectrons: 3, Group: 13},
	{Z: 26, Symbol: "Fe", Name: "iron", AtomicWeight: 55.845, Electronegativity: 1.83, MetallicRadiusCN12: 1.274, ValenceElectrons: 8, Group: 8},
	{Z: 29, Symbol: "Cu", Name: "copper", AtomicWeight: 63.546, Electronegativity: 1.90, MetallicRadiusCN12: 1.278, ValenceElectrons: 11, Group: 11},
}
