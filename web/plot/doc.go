// Package plot draws meltbook's figures as compact SVG, on the server and
// without HTTP: the Gibbs-triangle composition map with e/a isolines, the
// descriptor scatter plots and the diffraction pattern.
//
// The geometry is kept apart from the drawing so that it can be tested on
// its own:
//
//   - Triangle projects a composition onto three corners, each a single
//     element or a group of elements, and maps the ternary coordinates to
//     the plane and back.
//   - Grid samples any scalar field over the triangle and extracts its
//     isolines by marching triangles; the e/a field of a valence scheme is
//     one such field.
//   - Class sorts a sample's recorded outcomes into one of six map classes,
//     each drawn with its own colour from the Okabe & Ito palette and its own
//     shape, so that no class depends on colour alone.
//
// The renderers (TernaryMap, Scatter, PatternPlot) write SVG with shared
// marker symbols (<use href="#...">), rounded coordinates and presentation
// attributes only (no style attributes), so that pages may forbid inline
// styles and a saved figure looks the same outside the page.
package plot
