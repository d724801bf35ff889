package element

// Scheme is a named table of Hume-Rothery valences (electrons contributed
// per atom) used to compute e/a. Valences may be negative (Raynor's
// transition-metal values).
type Scheme struct {
	Name   string
	Source string
	// Valence maps element symbol to valence.
	Valence map[string]float64
}

// ValenceOf returns the valence of symbol in the scheme.
func (s Scheme) ValenceOf(symbol string) (float64, bool) {
	v, ok := s.Valence[symbol]
	return v, ok
}
