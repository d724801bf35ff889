// Package scanfile reads powder diffraction scans from the text files
// diffractometers and refinement programs write: two-column XY (2θ,
// intensity), three-column XYE (2θ, intensity, standard uncertainty) and
// powder CIF (the IUCr pdCIF dictionary).
//
// Read picks the format from the file name and content and returns a Scan.
// Every reader refuses bad data with an *Error that names the file, the
// line and, where it applies, the column and field: a value that is not a
// number or not finite, a negative intensity or uncertainty, 2θ that does
// not strictly increase or lies outside [0°, 180°), rows with differing
// numbers of fields, and scans of fewer than MinPoints points.
//
// # XY and XYE text
//
//   - Lines end in LF, CRLF or CR. A UTF-8 byte-order mark is skipped.
//     Blank lines are ignored.
//   - A line whose first non-blank character is '#', '!' or ';' is a
//     comment. On other lines everything from a '#' on is a comment.
//   - Before the first data row, a line whose first field is not a number
//     is a header line ("2Theta Counts", an instrument name). Comments and
//     header lines are kept in Scan.Header. A header line must therefore not
//     begin with a number; after the first data row, a line that does not
//     read as numbers is an error.
//   - The first data row fixes the field separator for the whole file: a
//     semicolon if the row holds one, else a comma if it holds one, else
//     runs of spaces and tabs. With the semicolon separator a field may use
//     a decimal comma ("28,44"). Spaces around separators are ignored.
//   - The first data row also fixes the number of fields: 2 (XY) or 3
//     (XYE); every later row must have as many.
//   - Numbers are decimal, with optional sign, fraction and exponent
//     ("1.5e3"). NaN, Inf, hexadecimal and digit separators are refused.
//
// # Powder CIF
//
// The CIF 1.1 syntax (comments, quoted strings, semicolon text fields,
// loop_, data_ and save_ frames) is read by meltbook/analysis/cif. The
// first data block holding a loop with an intensity column is the
// pattern: intensity is taken from _pd_meas_counts_total, else
// _pd_meas_intensity_total, else
// _pd_proc_intensity_total, with standard uncertainties written in
// parentheses ("1234(35)"). 2θ comes from a looped _pd_meas_2theta_scan,
// _pd_meas_angle_2theta or _pd_proc_2theta_corrected, or, when not looped,
// from _pd_meas_2theta_range_min, _max and _inc (or the _pd_proc_ ones).
// _diffrn_radiation_wavelength (and its _wt weights) and
// _diffrn_source_target are read from the pattern block or, failing that,
// from any other block.
//
// Reference: S. R. Hall, F. H. Allen and I. D. Brown, Acta Cryst. A47, 655
// (1991) (CIF); B. H. Toby, the pdCIF dictionary, International Tables for
// Crystallography Vol. G (2005), ch. 3.3 and 4.3.
package scanfile
