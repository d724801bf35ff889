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
// Which phases are built in, where each was published, and which wanted
// phases are left out (because no published structure could be checked) is
// listed in the package's README-like comment of builtin.go and by
// `meltbook phases`.
package phaselib
