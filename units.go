package meltbook

// SIUnit returns the symbol of the SI unit a parameter of this dimension is
// stored in ("" for text and plain numbers).
func (d Dimension) SIUnit() string {
	switch d {
	case Length:
		return "m"
	case Speed:
		return "m/s"
	case Pressure:
		return "Pa"
	case Temperature:
		return "K"
	case Duration:
		return "s"
	case Current:
		return "A"
	case Mass:
		return "kg"
	case CoolingRate:
		return "K/s"
	}
	return ""
}

// ParamSpecFor returns the specification of the named parameter of a step
// kind.
func ParamSpecFor(kind StepKind, name string) (ParamSpec, bool) {
	for _, s := range StepParams[kind] {
		if s.Name == name {
			return s, true
		}
	}
	return ParamSpec{}, false
}
