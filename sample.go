package meltbook

import (
	"math"
	"strings"
	"time"
)

// Sample is a piece of material: the melt itself (ParentID nil) or a piece
// derived from another sample by a process step, such as an annealed ribbon.
type Sample struct {
	ID       int64  `json:"-"`
	MeltID   int64  `json:"-"`
	ParentID *int64 `json:"-"`
	// Code is unique in the notebook; derived samples extend their parent's
	// code, e.g. "QX-0042" -> "QX-0042.a1".
	Code       string    `json:"code"`
	ParentCode string    `json:"parent,omitempty"`
	Label      string    `json:"label,omitempty"`
	CreatedAt  time.Time `json:"created_at"`
}

// StepKind names a kind of process step.
type StepKind string

// The process step kinds.
const (
	ArcMelt   StepKind = "arc-melt"
	MeltSpin  StepKind = "melt-spin"
	Anneal    StepKind = "anneal"
	OtherStep StepKind = "other"
)

// Dimension is the physical dimension of a step parameter; values are
// stored in the SI unit given beside each.
type Dimension string

// The dimensions of step parameters and their SI units.
const (
	Text          Dimension = "text"          // free text (gas, wheel material)
	Count         Dimension = "count"         // dimensionless number
	Length        Dimension = "length"        // m
	Speed         Dimension = "speed"         // m/s
	Pressure      Dimension = "pressure"      // Pa
	Temperature   Dimension = "temperature"   // K
	Duration      Dimension = "duration"      // s
	Current       Dimension = "current"       // A
	Mass          Dimension = "mass"          // kg
	CoolingRate   Dimension = "cooling-rate"  // K/s
	Dimensionless Dimension = "dimensionless" // ratio
)

// ParamSpec describes one parameter a step kind records.
type ParamSpec struct {
	Name      string
	Dimension Dimension
	// DisplayUnit is the unit shown when the user gave none.
	DisplayUnit string
	Help        string
}

// StepParams lists the parameters each step kind records, in display order.
// Names are stable: files, the command line and the store use them.
var StepParams = map[StepKind][]ParamSpec{
	ArcMelt: {
		{"remelts", Count, "", "number of times the button was flipped and remelted"},
		{"current", Current, "A", "arc current, if known"},
		{"atmosphere", Text, "", "chamber gas, e.g. Ar after Ti getter"},
		{"chamber-pressure", Pressure, "kPa", "chamber pressure during melting"},
	},
	MeltSpin: {
		{"wheel-material", Text, "", "wheel material, e.g. Cu or CuBe"},
		{"wheel-speed", Speed, "m/s", "wheel surface speed"},
		{"orifice", Length, "mm", "nozzle orifice diameter"},
		{"gap", Length, "mm", "nozzle-to-wheel gap"},
		{"ejection-pressure", Pressure, "kPa", "ejection over-pressure"},
		{"melt-temperature", Temperature, "°C", "melt temperature at ejection"},
		{"chamber-gas", Text, "", "chamber gas"},
		{"chamber-pressure", Pressure, "kPa", "chamber pressure"},
		{"thickness", Length, "µm", "ribbon thickness"},
		{"width", Length, "mm", "ribbon width"},
		{"cooling-rate", CoolingRate, "K/s", "estimated cooling rate"},
		{"cooling-regime", Text, "", "regime and model of the cooling estimate"},
	},
	Anneal: {
		{"temperature", Temperature, "°C", "anneal temperature"},
		{"time", Duration, "h", "time at temperature"},
		{"atmosphere", Text, "", "atmosphere or vacuum, e.g. sealed silica under Ar"},
		{"cooling", Text, "", "quench medium or furnace cool"},
	},
	OtherStep: {
		{"description", Text, "", "what was done"},
	},
}

// Param is one recorded parameter of a step: a number in SI units with the
// unit the user wrote it in (for showing back), or a text.
type Param struct {
	Name string  `json:"name"`
	SI   float64 `json:"si,omitempty"`
	// Unit is the unit the value was entered in, used to show it back.
	Unit string `json:"unit,omitempty"`
	Text string `json:"text,omitempty"`
}

// ProcessStep is one thing done to a sample, in order.
type ProcessStep struct {
	ID       int64     `json:"-"`
	SampleID int64     `json:"-"`
	Seq      int       `json:"seq"`
	Kind     StepKind  `json:"kind"`
	At       time.Time `json:"at"`
	Operator string    `json:"operator"`
	Params   []Param   `json:"params"`
	Notes    string    `json:"notes,omitempty"`
}

// Param returns the named parameter.
func (s *ProcessStep) Param(name string) (Param, bool) {
	for _, p := range s.Params {
		if p.Name == name {
			return p, true
		}
	}
	return Param{}, false
}

// Validate checks the step's kind and parameters against StepParams.
func (s *ProcessStep) Validate() error {
	specs, ok := StepParams[s.Kind]
	if !ok {
		return Errorf(Invalid, "step", "unknown step kind %q (known: arc-melt, melt-spin, anneal, other)", s.Kind)
	}
	seen := map[string]bool{}
	for _, p := range s.Params {
		var spec *ParamSpec
		for i := range specs {
			if specs[i].Name == p.Name {
				spec = &specs[i]
			}
		}
		field := string(s.Kind) + "." + p.Name
		if spec == nil {
			return Errorf(Invalid, field, "not a parameter of a %s step", s.Kind)
		}
		if seen[p.Name] {
			return Errorf(Invalid, field, "given twice")
		}
		seen[p.Name] = true
		if spec.Dimension == Text {
			if strings.TrimSpace(p.Text) == "" {
				return Errorf(Invalid, field, "empty")
			}
			continue
		}
		if math.IsNaN(p.SI) || math.IsInf(p.SI, 0) {
			return Errorf(Invalid, field, "not a finite number")
		}
		if p.SI < 0 || (p.SI == 0 && spec.Dimension != Count) {
			return Errorf(Invalid, field, "must be positive, got %g", p.SI)
		}
	}
	return nil
}
