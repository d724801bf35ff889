package descriptor

import (
	"math"
	"strconv"
	"strings"

	"meltbook/analysis/composition"
	"meltbook/analysis/element"
)

// Window is a published e/a range in which stable icosahedral phases of
// an alloy family formed.
type Window struct {
	// Family names the alloy family, e.g. "Al-Cu-(Fe,Ru,Os)".
	Family string
	// Low and High bound e/a, inclusive.
	Low, High float64
	// Valences are the valences the source counted with; the window is
	// compared only when the scheme in use gives the same values for the
	// elements present.
	Valences map[string]float64
	// Source cites the window and says which parts were read from the
	// paper and which are from memory.
	Source string

	// members are the elements the family may contain; required lists
	// element groups of which at least one must be present; major is an
	// element with a minimum fraction.
	members  map[string]bool
	required [][]string
	major    string
	minMajor float64
}

// rareEarthsTrivalent are Sc, Y and the lanthanides that are trivalent in
// the metal; Eu and Yb are divalent and handled separately.
var rareEarthsTrivalent = []string{"Sc", "Y", "La", "Ce", "Pr", "Nd", "Sm", "Gd", "Tb", "Dy", "Ho", "Er", "Tm", "Lu"}

func set(groups ...[]string) map[string]bool {
	m := map[string]bool{}
	for _, g := range groups {
		for _, s := range g {
			m[s] = true
		}
	}
	return m
}

func valences(groups map[float64][]string) map[string]float64 {
	m := map[string]float64{}
	for v, syms := range groups {
		for _, s := range syms {
			m[s] = v
		}
	}
	return m
}

var windows = []Window{
	{
		Family: "Al-Cu-(Fe,Ru,Os)",
		Low:    1.70, High: 1.80,
		Valences: valences(map[float64][]string{3: {"Al"}, 1: {"Cu"}, -2.66: {"Fe", "Ru", "Os"}}),
		Source: "A. P. Tsai, A. Inoue, T. Masumoto, J. Non-Cryst. Solids 117-118, 824 (1990): stable " +
			"icosahedral Al-Cu-(Fe, Ru or Os) phases at e/a = 1.7-1.8 (range read from the abstract; volume " +
			"number from memory). Valences Al 3, Cu 1, Fe -2.66 (Raynor) are the ones that put the stable " +
			"Al65Cu20Fe15 at e/a 1.75 (from memory); Ru and Os are counted like Fe, which places the stable " +
			"Al65Cu20Ru15 and Al65Cu20Os15 (Tsai, Inoue, Masumoto, Jpn. J. Appl. Phys. 27, L1587 (1988)) " +
			"at the same e/a.",
		members:  set([]string{"Al", "Cu", "Fe", "Ru", "Os"}),
		required: [][]string{{"Cu"}, {"Fe", "Ru", "Os"}},
		major:    "Al", minMajor: 0.5,
	},
	{
		Family: "Al-Pd-Mn",
		Low:    1.60, High: 1.80,
		Valences: valences(map[float64][]string{3: {"Al"}, 0: {"Pd"}, -3.66: {"Mn"}}),
		Source: "A. P. Tsai, Y. Yokoyama, T. Masumoto, A. Inoue, Jpn. J. Appl. Phys. 29, L1161 (1990): " +
			"quasicrystals in Al-Pd-TM form in narrow ranges with e/a between 1.6 and 1.8 (read from the " +
			"abstract). Valences Al 3, Pd 0, Mn -3.66 (Raynor) from memory; they put Al70Pd20Mn10 at 1.73.",
		members:  set([]string{"Al", "Pd", "Mn"}),
		required: [][]string{{"Pd"}, {"Mn"}},
		major:    "Al", minMajor: 0.5,
	},
	{
		Family: "Zn-Mg-RE",
		Low:    2.00, High: 2.15,
		Valences: valences(map[float64][]string{2: {"Zn", "Mg"}, 3: rareEarthsTrivalent}),
		Source: "Hume-Rothery criterion for Zn-based quasicrystals, e/a = 2.0-2.15, as quoted in the " +
			"abstract of a Z-contrast study of the stable Zn-Mg-Y decagonal phase (\"A decagonal quasicrystal " +
			"with rhombic and hexagonal tiles decorated with icosahedral structural units\"; authors and " +
			"journal not verified). Valences Zn 2, Mg 2, trivalent rare earths and Y 3 (common practice).",
		members:  set([]string{"Zn", "Mg"}, rareEarthsTrivalent),
		required: [][]string{{"Mg"}, rareEarthsTrivalent},
		major:    "Zn", minMajor: 0.4,
	},
	{
		Family: "Cd-(Yb,Ca,RE)",
		Low:    2.00, High: 2.15,
		Valences: valences(map[float64][]string{2: {"Cd", "Mg", "Ca", "Yb"}, 3: rareEarthsTrivalent}),
		Source: "J. Q. Guo, E. Abe, A. P. Tsai, Phil. Mag. Lett. 82, 27 (2002): stable Cd-Mg-Yb and " +
			"Cd-Mg-Ca icosahedral phases at e/a = 2.0 (Yb divalent); J. Q. Guo, E. Abe, A. P. Tsai, " +
			"Jpn. J. Appl. Phys. 39, L770 (2000): Cd65Mg20RE15 icosahedral phases at e/a = 2.15 (RE " +
			"trivalent); both read from the abstracts, the 2002 volume number from memory. The binary " +
			"Cd5.7Yb (A. P. Tsai et al., Nature 408, 537 (2000), from memory) sits at 2.0.",
		members:  set([]string{"Cd", "Mg", "Ca", "Yb"}, rareEarthsTrivalent),
		required: [][]string{append([]string{"Yb", "Ca"}, rareEarthsTrivalent...)},
		major:    "Cd", minMajor: 0.25,
	},
}

// Windows returns the e/a windows Describe compares with, e.g. to draw
// e/a bands on a composition map.
func Windows() []Window {
	out := make([]Window, len(windows))
	copy(out, windows)
	return out
}

// Matches reports whether composition c belongs to the window's family:
// only the family's elements, the major element at or above its minimum
// fraction, and at least one element from each required group.
func (w Window) Matches(c composition.Composition) bool {
	var major float64
	for _, p := range c {
		if !w.members[p.Element] {
			return false
		}
		if p.Element == w.major {
			major = p.Fraction
		}
	}
	if major < w.minMajor {
		return false
	}
	for _, group := range w.required {
		found := false
		for _, s := range group {
			if c.Fraction(s) > 0 {
				found = true
				break
			}
		}
		if !found {
			return false
		}
	}
	return true
}

func formatEA(v float64) string { return strconv.FormatFloat(v, 'f', 3, 64) }

func windowRange(w Window) string {
	return strconv.FormatFloat(w.Low, 'f', 2, 64) + "-" + strconv.FormatFloat(w.High, 'f', 2, 64)
}

// windowFlag compares e/a with the window of c's family.
func windowFlag(c composition.Composition, scheme element.Scheme, ea float64) Flag {
	for _, w := range windows {
		if !w.Matches(c) {
			continue
		}
		var differ []string
		for _, p := range c {
			want := w.Valences[p.Element]
			got, _ := scheme.ValenceOf(p.Element)
			if math.Abs(got-want) > valenceMatchTolerant {
				differ = append(differ, p.Element+" "+strconv.FormatFloat(want, 'g', -1, 64)+
					" (scheme: "+strconv.FormatFloat(got, 'g', -1, 64)+")")
			}
		}
		if len(differ) > 0 {
			return Flag{
				Code: FlagOtherValences,
				Text: "the " + w.Family + " window " + windowRange(w) + " counts " + strings.Join(differ, ", ") +
					"; e/a under scheme " + strconv.Quote(scheme.Name) + " is not comparable with it",
				Source: w.Source,
			}
		}
		switch {
		case ea < w.Low-windowEdgeTolerance:
			return Flag{Code: FlagBelowWindow, Source: w.Source,
				Text: "e/a " + formatEA(ea) + " is below the " + w.Family + " window " + windowRange(w) +
					" where stable icosahedral phases formed (a guide, not a phase boundary)"}
		case ea > w.High+windowEdgeTolerance:
			return Flag{Code: FlagAboveWindow, Source: w.Source,
				Text: "e/a " + formatEA(ea) + " is above the " + w.Family + " window " + windowRange(w) +
					" where stable icosahedral phases formed (a guide, not a phase boundary)"}
		default:
			return Flag{Code: FlagInsideWindow, Source: w.Source,
				Text: "e/a " + formatEA(ea) + " is inside the " + w.Family + " window " + windowRange(w) +
					" where stable icosahedral phases formed (a guide, not a phase boundary)"}
		}
	}
	return Flag{Code: FlagNoWindow,
		Text:   "meltbook holds no published e/a window for this set of elements",
		Source: "families held: Al-Cu-(Fe,Ru,Os), Al-Pd-Mn, Zn-Mg-RE, Cd-(Yb,Ca,RE)"}
}
