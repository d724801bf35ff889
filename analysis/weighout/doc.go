// Package weighout plans the masses of elemental pieces to weigh for an
// alloy button: from the atomic composition, the button mass, the purity
// of each piece and an allowance for elements that evaporate during
// melting. It prints the sheet as a text table, CSV or JSON, with the
// bench cautions for the elements involved.
package weighout
