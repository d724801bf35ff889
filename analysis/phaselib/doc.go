// Package phaselib is the library of crystalline phases of known structure
// that the indexer's search-match tries: the phases that compete with
// quasicrystals in the alloy systems meltbook's users melt, embedded in the
// program as one CIF file per phase, plus any CIF files a user keeps in a
// folder of their own.
//
// Each phase is read with crystal.ReadCIF; its powder lines at a scan's
// wavelength come from the powder package (structure factors with the
// International Tables atomic scattering factors, multiplicity,
// Lorentz–polarisation and isotropic displacement) and are handed to the
// indexer as an indexing.KnownPhase.
//
// Phase names may carry Greek letters in the CIF text markup (\q-Al2Cu is
// θ-Al2Cu; see the CIF 1.1 specification, "Greek letters"), so that the
// files stay ASCII while the notebook shows the names metallurgists use.
//
// Each built-in file names its publication and, in a "# Provenance:"
// comment, what of it was checked and how. The wanted phases left out,
// because no published structure could be checked, are listed in
// NotBuiltIn; `meltbook phases` prints both.
//
// To add a phase to the built-in library, put its CIF in phases/ with
// _chemical_name_common (Greek letters in CIF markup), the publication
// (_publ_author_name, _journal_name_full, _journal_volume,
// _journal_page_first, _journal_year) and a provenance comment, and add it
// to the table of TestBuiltinPhases; the tests then check it against gemmi
// and pymatgen (its pattern, named by the search-match), its stoichiometry
// and its interatomic distances.
package phaselib
