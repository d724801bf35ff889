package meltbook

// MeltRecord is everything the notebook holds about one melt, as shown by
// the command line and the web page.
type MeltRecord struct {
	Melt Melt `json:"melt"`
	// EOverA holds the nominal e/a under each valence scheme the notebook
	// keeps ("group", "raynor") that defines every element of the melt.
	EOverA map[string]float64 `json:"e_over_a,omitempty"`
	// CoolingRateKPerS is the estimated cooling rate of the melt's first
	// melt-spin step that records one.
	CoolingRateKPerS *float64 `json:"cooling_rate_k_per_s,omitempty"`
	// Samples in tree order: the melt's own sample first, then each
	// sample's derived pieces depth-first, oldest first.
	Samples []SampleRecord `json:"samples"`
	// Notes on the melt and its samples, oldest first.
	Notes   []Note         `json:"notes,omitempty"`
	History []HistoryEntry `json:"history"`
}

// SampleRecord is one sample with what was done to it and found in it.
type SampleRecord struct {
	Sample
	// Depth is 0 for the melt's own sample, 1 for a piece derived from it,
	// and so on.
	Depth        int                   `json:"depth"`
	Steps        []ProcessStep         `json:"steps,omitempty"`
	Measurements []MeasuredComposition `json:"measurements,omitempty"`
	Symmetry     []SymmetryObservation `json:"symmetry,omitempty"`
	// Outcomes: a person's first, then automatic ones (confirmed, proposed,
	// rejected), each group oldest first.
	Outcomes []Outcome `json:"outcomes,omitempty"`
}
