package element

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"sort"
	"strings"
)

// Scheme is a named table of Hume-Rothery valences (electrons contributed
// per atom) used to compute e/a. Valences may be negative (Raynor's
// transition-metal values).
type Scheme struct {
	Name   string
	Source string
	// Valence maps element symbol to valence.
	Valence map[string]float64
	// Notes maps element symbol to where that element's valence comes from,
	// when it is more specific than Source. It may be nil.
	Notes map[string]string
}

// ValenceOf returns the valence of symbol in the scheme.
func (s Scheme) ValenceOf(symbol string) (float64, bool) {
	v, ok := s.Valence[symbol]
	return v, ok
}

// Require returns the valence of symbol, or a *MissingValenceError that
// names the element and the scheme and says what to do instead.
func (s Scheme) Require(symbol string) (float64, error) {
	if v, ok := s.Valence[symbol]; ok {
		return v, nil
	}
	return 0, &MissingValenceError{Scheme: s.Name, Symbol: symbol, Hint: missingHint(s.Name, symbol)}
}

// Symbols lists the elements the scheme defines, ordered by atomic number
// (unknown symbols, which only a hand-built Scheme can hold, last).
func (s Scheme) Symbols() []string {
	out := make([]string, 0, len(s.Valence))
	for sym := range s.Valence {
		out = append(out, sym)
	}
	z := func(sym string) int {
		if i, ok := bySymbol[sym]; ok {
			return i
		}
		return len(table)
	}
	sort.Slice(out, func(i, j int) bool {
		if z(out[i]) != z(out[j]) {
			return z(out[i]) < z(out[j])
		}
		return out[i] < out[j]
	})
	return out
}

// Clone returns a deep copy, so that changing it leaves s alone.
func (s Scheme) Clone() Scheme {
	c := Scheme{Name: s.Name, Source: s.Source, Valence: make(map[string]float64, len(s.Valence))}
	for k, v := range s.Valence {
		c.Valence[k] = v
	}
	if s.Notes != nil {
		c.Notes = make(map[string]string, len(s.Notes))
		for k, v := range s.Notes {
			c.Notes[k] = v
		}
	}
	return c
}

// MissingValenceError reports an element that a valence scheme does not
// define.
type MissingValenceError struct {
	Scheme string
	Symbol string
	// Hint suggests another scheme or a scheme file.
	Hint string
}

func (e *MissingValenceError) Error() string {
	msg := fmt.Sprintf("valence scheme %q has no valence for %s", e.Scheme, e.Symbol)
	if e.Hint != "" {
		msg += ": " + e.Hint
	}
	return msg
}

func missingHint(scheme, symbol string) string {
	e, known := BySymbol(symbol)
	switch {
	case !known:
		return "not an element symbol (symbols are case-sensitive, e.g. Co)"
	case scheme == GroupScheme && e.Group >= 4 && e.Group <= 10:
		return fmt.Sprintf("%s is a transition metal; use scheme %q, or a scheme file that sets it", symbol, RaynorScheme)
	case scheme == RaynorScheme && e.Group >= 4 && e.Group <= 10:
		return fmt.Sprintf("no Raynor valence is published for %s; give one in a scheme file based on %q (see ReadScheme)", symbol, RaynorScheme)
	default:
		return fmt.Sprintf("give it in a scheme file (a line %q with your value; see ReadScheme)", symbol+" <valence>")
	}
}

// Names of the built-in schemes.
const (
	GroupScheme  = "group"
	RaynorScheme = "raynor"
)

// SchemeNames lists the built-in valence schemes.
func SchemeNames() []string { return []string{GroupScheme, RaynorScheme} }

// LookupScheme returns a copy of the built-in scheme with the given name
// ("group" or "raynor").
func LookupScheme(name string) (Scheme, bool) {
	s, ok := builtIn[name]
	if !ok {
		return Scheme{}, false
	}
	return s.Clone(), true
}

// builtIn holds the built-in schemes; LookupScheme hands out clones.
var builtIn = map[string]Scheme{
	GroupScheme:  groupScheme(),
	RaynorScheme: raynorScheme(),
}

// LoadScheme returns the built-in scheme called nameOrPath, or else reads
// the scheme file at that path (format: see ReadScheme).
func LoadScheme(nameOrPath string) (Scheme, error) {
	if s, ok := LookupScheme(nameOrPath); ok {
		return s, nil
	}
	f, err := os.Open(nameOrPath)
	if err != nil {
		if errors.Is(err, fs.ErrNotExist) && !strings.ContainsAny(nameOrPath, `/\.`) {
			return Scheme{}, fmt.Errorf("unknown valence scheme %q: built-in schemes are %s; otherwise give the path of a scheme file",
				nameOrPath, strings.Join(SchemeNames(), ", "))
		}
		return Scheme{}, fmt.Errorf("load valence scheme: %w", err)
	}
	defer f.Close()
	return ReadScheme(f, nameOrPath)
}

// groupScheme gives the non-transition elements their group valence.
//
//	1: Li, Na, K, Rb, Cs; Cu, Ag, Au
//	2: Be, Mg, Ca, Sr, Ba; Zn, Cd, Hg; Eu, Yb
//	3: B, Al, Ga, In, Tl; Sc, Y, La-Lu except Eu and Yb
//	4: C, Si, Ge, Sn, Pb
//	5: P, As, Sb, Bi
//
// Eu and Yb are divalent in the metal: their 4f shell holds 7 and 14
// electrons (half-full and full), so only the two 6s electrons are
// conduction electrons, which the atomic volumes of the metals show; the
// Cd-Yb quasicrystals are treated with Yb²⁺. The transition metals of
// groups 4-10 (Ti to Ni, Zr to Pd, Hf to Pt) are deliberately not defined:
// a simple group valence for them is not meaningful for e/a, and e/a fails
// with an error that names the element and points to the raynor scheme or
// a scheme file.
//
// Reference: W. Hume-Rothery's electron-concentration rules (common
// practice); Eu²⁺ and Yb²⁺ in the metals, common practice.
func groupScheme() Scheme {
	s := Scheme{
		Name: GroupScheme,
		Source: "group valences of the non-transition elements (common practice, after Hume-Rothery): " +
			"1 for the alkali metals and Cu, Ag, Au; 2 for Be-Ba, Zn, Cd, Hg; 3 for B-Tl, Sc, Y and the " +
			"trivalent rare earths; 2 for Eu and Yb; 4 for C-Pb; 5 for P-Bi; transition metals Ti-Ni, " +
			"Zr-Pd, Hf-Pt not defined",
		Valence: map[string]float64{},
		Notes: map[string]string{
			"Eu": "divalent in the metal (4f⁷ core); common practice",
			"Yb": "divalent in the metal (4f¹⁴ core), as in Cd-Yb quasicrystals; common practice",
		},
	}
	set := func(v float64, symbols ...string) {
		for _, sym := range symbols {
			s.Valence[sym] = v
		}
	}
	set(1, "Li", "Na", "K", "Rb", "Cs", "Cu", "Ag", "Au")
	set(2, "Be", "Mg", "Ca", "Sr", "Ba", "Zn", "Cd", "Hg", "Eu", "Yb")
	set(3, "B", "Al", "Ga", "In", "Tl", "Sc", "Y",
		"La", "Ce", "Pr", "Nd", "Pm", "Sm", "Gd", "Tb", "Dy", "Ho", "Er", "Tm", "Lu")
	set(4, "C", "Si", "Ge", "Sn", "Pb")
	set(5, "P", "As", "Sb", "Bi")
	return s
}

// Raynor's valences for the 3d transition metals in aluminium-rich alloys.
const (
	raynorCr = -4.66
	raynorMn = -3.66
	raynorFe = -2.66
	raynorCo = -1.71
	raynorNi = -0.61
)

// raynorScheme is the group scheme plus negative valences for transition
// metals, which in aluminium-rich alloys absorb conduction electrons into
// their partly empty d shells:
//
//	Cr −4.66   Mn −3.66   Fe −2.66   Co −1.71   Ni −0.61   (Raynor)
//	Mo, W −4.66; Tc, Re −3.66; Ru, Os −2.66; Rh, Ir −1.71  (homologues)
//	Pd, Pt 0
//
// Raynor took the number of electrons accepted per atom equal to the
// vacancies in Pauling's "atomic orbitals" for each metal. The 4d and 5d
// homologues are given the value of the 3d metal above them, as done when
// Al-Cu-Ru and Al-Cu-Os quasicrystals are compared with Al-Cu-Fe at the
// same e/a, and Re is treated like Mn in Al-Pd-Re. Pd (and Pt) is taken as
// 0, the usual choice for Al-Pd-Mn e/a; note that this departs from the
// homologue rule (Ni is −0.61). Early transition metals (Ti, V, Zr, Nb, Hf,
// Ta) have no Raynor value and stay undefined; set them in a scheme file.
//
// Reference: G. V. Raynor, Prog. Met. Phys. 1, 1 (1949) for Cr-Ni
// (citation and values as commonly quoted, from memory; the mechanism,
// acceptance of electrons up to Pauling's atomic-orbital vacancies, is
// stated in Raynor's own abstract on Al-Si-(Cr, Mn, Fe, Co, Ni) alloys);
// homologues and Pd 0: common practice.
func raynorScheme() Scheme {
	s := groupScheme()
	s.Name = RaynorScheme
	s.Source = "group scheme plus Raynor's transition-metal valences Cr −4.66, Mn −3.66, Fe −2.66, " +
		"Co −1.71, Ni −0.61 (G. V. Raynor, Prog. Met. Phys. 1, 1 (1949)); 4d/5d homologues take the " +
		"3d value (Mo, W; Tc, Re; Ru, Os; Rh, Ir); Pd and Pt 0 (common practice)"
	raynor := "Raynor (1949): electrons accepted into Pauling's atomic-orbital vacancies"
	for sym, v := range map[string]float64{"Cr": raynorCr, "Mn": raynorMn, "Fe": raynorFe, "Co": raynorCo, "Ni": raynorNi} {
		s.Valence[sym] = v
		s.Notes[sym] = raynor
	}
	homologues := map[string]string{"Mo": "Cr", "W": "Cr", "Tc": "Mn", "Re": "Mn", "Ru": "Fe", "Os": "Fe", "Rh": "Co", "Ir": "Co"}
	for sym, of := range homologues {
		s.Valence[sym] = s.Valence[of]
		s.Notes[sym] = "homologue of " + of + ", given Raynor's " + of + " value; common practice"
	}
	for _, sym := range []string{"Pd", "Pt"} {
		s.Valence[sym] = 0
		s.Notes[sym] = "0 as usual in Al-Pd-Mn e/a work; common practice"
	}
	return s
}
