package seed

import (
	"time"

	"meltbook"
)

// Lab is the invented laboratory whose notebook the seed fills.
type Lab struct {
	// Name of the group and of its (fictional) institute.
	Name      string
	Institute string
	// CodePrefix starts every melt code: "QR-0001", "QR-0002", ...
	CodePrefix string
	Operators  []Operator
	// From and To bound the dates of the runs.
	From, To time.Time
	// Description is a paragraph for the notebook's front page.
	Description string
}

// Operator is one invented member of the lab.
type Operator struct {
	Name     string
	Initials string
	Role     string
}

// Run is one melt with everything done to it: the root sample's process
// steps (arc melt or induction melt, then melt spin), its measurements and
// outcomes, notes, and the pieces derived from it by annealing.
type Run struct {
	// System names the alloy system, e.g. "Al-Cu-Fe".
	System string
	Melt   meltbook.Melt
	// Steps are the root sample's steps in order (Seq 1, 2).
	Steps        []meltbook.ProcessStep
	Measured     []meltbook.MeasuredComposition
	Observations []meltbook.SymmetryObservation
	Outcomes     []meltbook.Outcome
	// Notes on the melt or its root sample (SampleCode empty).
	Notes   []meltbook.Note
	Derived []Derived
}

// Derived is a piece of a run's ribbon treated further, here annealed.
type Derived struct {
	// Sample carries the code ("QR-0042.a1"), the parent code and a label.
	Sample       meltbook.Sample
	Step         meltbook.ProcessStep
	Measured     []meltbook.MeasuredComposition
	Observations []meltbook.SymmetryObservation
	Outcomes     []meltbook.Outcome
	// Notes on this piece (SampleCode set to its code).
	Notes []meltbook.Note
}

// Notebook is the whole invented notebook, runs in order of their codes.
type Notebook struct {
	Lab  Lab
	Runs []Run
}

// The invented lab. The names are made up for the demonstration; any
// likeness to a real group or person is unintended.
func newLab() Lab {
	return Lab{
		Name:       "Rapid Solidification Group",
		Institute:  "Quillmere Institute for Materials (fictional)",
		CodePrefix: "QR",
		Operators: []Operator{
			{Name: "Marit Solvang", Initials: "MS", Role: "staff scientist"},
			{Name: "Dario Keszthelyi", Initials: "DK", Role: "postdoctoral researcher"},
			{Name: "Aiko Brannigan", Initials: "AB", Role: "doctoral student"},
			{Name: "Femi Lindqvist", Initials: "FL", Role: "melting technician"},
			{Name: "Yusuf Arkwright", Initials: "YA", Role: "doctoral student"},
		},
		From: time.Date(2026, time.January, 12, 0, 0, 0, 0, time.UTC),
		To:   time.Date(2026, time.October, 23, 0, 0, 0, 0, time.UTC),
		Description: "An invented group that arc-melts and melt-spins candidate quasicrystal alloys " +
			"(Al-Cu-Fe, Al-Cu-Fe-Si, Al-Pd-Mn, Al-Mn-Si and Zn-Mg-Y), anneals some ribbons and decides " +
			"the phases from powder XRD and electron diffraction. Every run, name and number is made up " +
			"for meltbook's demonstration notebook.",
	}
}

// Operator indices, for campaign leads.
const (
	opMarit = iota
	opDario
	opAiko
	opFemi
	opYusuf
)
