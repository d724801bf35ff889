package hazard

import (
	"slices"
	"strings"

	"meltbook/analysis/element"
)

// Kind names what a caution is about.
type Kind string

// Caution kinds. The element kinds follow element.Hazard; the others come
// from the process.
const (
	Toxic          Kind = "toxic"
	ReadilyBurning Kind = "readily-burning"
	Radioactive    Kind = "radioactive"
	UnknownElement Kind = "unknown-element"
	MoltenMetal    Kind = "molten-metal"
	PressurisedGas Kind = "pressurised-gas"
	SpinningWheel  Kind = "spinning-wheel"
	Asphyxiation   Kind = "asphyxiation"
	HotParts       Kind = "hot-parts"
	LocalRules     Kind = "local-rules"
)

// Caution is one bench reminder.
type Caution struct {
	Kind Kind
	// Elements lists the symbols the caution is about, in the order they
	// were given; empty for process cautions.
	Elements []string
	Text     string
}

// deferral closes every list of cautions.
var deferral = Caution{
	Kind: LocalRules,
	Text: "These notes are reminders, not a safety procedure. Your laboratory's own rules, " +
		"its safety officer and the staff trained on the equipment decide how the work is done; " +
		"ask them before starting anything new to you.",
}

var kindText = map[Kind]string{
	Toxic: "Poisonous as dust, vapour or fume: weigh and melt under local exhaust or in a " +
		"sealed vessel, wear gloves, keep food away, clean up with a wet wipe or a suitable vacuum " +
		"(never dry sweeping) and collect the waste for hazardous disposal.",
	ReadilyBurning: "Ignites easily as turnings, powder, thin foil or vapour: keep fine pieces " +
		"under argon or as the supplier advises, keep a class D extinguisher or dry sand at hand " +
		"(never water or CO2 on a metal fire), and let furnace dross cool under inert gas before opening.",
	Radioactive: "Has no stable isotope: handling needs the laboratory's radiation permit, " +
		"dosimetry and contamination checks under the radiation protection officer's rules.",
	UnknownElement: "Not found in meltbook's element table, so no hazard is known to meltbook: " +
		"read the supplier's safety data sheet before use.",
}

// elementNotes add a sentence for elements whose danger is specific
// enough to name, whatever the table's flags say. Boiling and sublimation
// points: CRC Handbook of Chemistry and Physics (from memory); the rest is
// common practice.
var elementNotes = map[string]note{
	"Be": {Toxic, "Beryllium: inhaled dust or fume can cause chronic beryllium disease; use only where the laboratory is set up for it."},
	"Cd": {Toxic, "Cadmium: boils near 767 °C, below most melt temperatures, and its fume damages the lungs and kidneys; melt in a sealed crucible or ampoule."},
	"Hg": {Toxic, "Mercury: gives off vapour at room temperature; keep it closed and have a spill kit ready."},
	"As": {Toxic, "Arsenic: sublimes near 615 °C and is carcinogenic; melt only in a sealed vessel."},
	"Tl": {Toxic, "Thallium: highly toxic and absorbed through the skin; double gloves."},
	"Pb": {Toxic, "Lead: fume and dust are toxic; follow the laboratory's lead-handling rules."},
	"Zn": {Toxic, "Zinc: boils near 907 °C, below many melt temperatures, and its oxide fume causes metal fume fever; melt under extraction and let the fume settle before opening the chamber."},
	"Li": {ReadilyBurning, "Lithium: reacts with water (giving hydrogen) and with nitrogen; handle in argon, not in air or a nitrogen glovebox."},
	"Mg": {ReadilyBurning, "Magnesium: burning magnesium reacts violently with water and CO2."},
	"Ca": {ReadilyBurning, "Calcium: reacts with water giving hydrogen; keep pieces dry."},
}

// Cautions returns the bench cautions for the given element symbols: one
// caution per hazard class present (listing the elements that carry it),
// element-specific notes for a few notorious elements, a caution for
// symbols not in the element table, and always, last, the line deferring
// to local rules and trained staff. Repeated symbols count once.
//
// Reference: hazard classes from the element table (element.Hazards);
// wording is meltbook's own (common practice).
func Cautions(elements []string) []Caution {
	var byKind [4][]string // toxic, burning, radioactive, unknown
	var notes []Caution
	for i, sym := range elements {
		if slices.Contains(elements[:i], sym) {
			continue
		}
		e, ok := element.BySymbol(sym)
		if !ok {
			byKind[3] = append(byKind[3], sym)
			continue
		}
		if e.Hazards&element.Toxic != 0 {
			byKind[0] = append(byKind[0], sym)
		}
		if e.Hazards&element.ReadilyBurning != 0 {
			byKind[1] = append(byKind[1], sym)
		}
		if e.Hazards&element.Radioactive != 0 {
			byKind[2] = append(byKind[2], sym)
		}
		if n, ok := elementNotes[sym]; ok {
			notes = append(notes, Caution{Kind: n.kind, Elements: []string{sym}, Text: n.text})
		}
	}
	var out []Caution
	for i, k := range []Kind{Toxic, ReadilyBurning, Radioactive, UnknownElement} {
		if len(byKind[i]) == 0 {
			continue
		}
		out = append(out, Caution{
			Kind:     k,
			Elements: byKind[i],
			Text:     strings.Join(byKind[i], ", ") + ": " + kindText[k],
		})
	}
	out = append(out, notes...)
	return append(out, deferral)
}

type note struct {
	kind Kind
	text string
}

// ProcessCautions returns the general cautions of arc melting and melt
// spinning, ending with the line deferring to local rules and trained
// staff.
//
// Reference: common practice.
func ProcessCautions() []Caution {
	return []Caution{
		{Kind: MoltenMetal, Text: "Molten alloy above 1000 °C: wear a face shield, flame-resistant " +
			"clothing and leather gloves; keep water and damp tools away from the melt, since water " +
			"trapped under liquid metal flashes to steam explosively."},
		{Kind: PressurisedGas, Text: "Pressurised gas: secure cylinders upright, use the right regulator, " +
			"check lines and the ejection over-pressure before each run, and never point the nozzle " +
			"at anyone while the chamber is open."},
		{Kind: SpinningWheel, Text: "Fast-spinning wheel: keep the guard and chamber closed while it turns, " +
			"let it stop completely before reaching in, and check its surface for cracks; ribbon " +
			"leaves the wheel fast and with sharp edges."},
		{Kind: Asphyxiation, Text: "Argon and other inert gases displace air without warning smell or " +
			"colour: vent chambers outside or into extraction, do not purge in a small closed room, and " +
			"use an oxygen monitor where the laboratory requires one."},
		{Kind: HotParts, Text: "Crucible, nozzle, induction coil and electrodes stay hot long after the " +
			"melt: handle them with tongs and let them cool before cleaning; quartz nozzles can shatter " +
			"on thermal shock."},
		deferral,
	}
}
