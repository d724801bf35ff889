package runsheet

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"
	"unicode"

	"meltbook"
	"meltbook/analysis/composition"
)

// Tentative starts the evidence of an outcome the sheet marked as
// uncertain ("i?", "maybe QC"); such an outcome has no fraction. The word
// is the one the demonstration notebook uses for results a lab could not
// settle.
const Tentative = "tentative"

// noOutcomeWords are outcome cells that record no phase.
var noOutcomeWords = map[string]bool{
	"": true, "-": true, "–": true, "—": true, "none": true, "nothing": true, "n/a": true, "na": true,
	"no ribbon": true, "failed": true, "not examined": true, "no result": true, "no xrd": true, "pending": true, "tbd": true,
}

var (
	percentRE         = regexp.MustCompile(`(\d+(?:[.,]\d+)?)\s*%`)
	orderRE           = regexp.MustCompile(`\b(\d{1,2})\s*/\s*(\d{1,2})\b`)
	strukturberichtRE = regexp.MustCompile(`^[A-Z]\d{1,2}[a-z]?$`)
	uncertainRE       = regexp.MustCompile(`(?i)^(maybe|possibly|probably|likely|tentative(ly)?|perhaps)\b|\?`)
	// greekNames are spelled-out Greek letters that name crystalline phases
	// ("beta", "lambda-Al13Fe4").
	greekNames = []string{"alpha", "beta", "gamma", "delta", "epsilon", "zeta", "eta", "theta", "kappa", "lambda", "mu", "xi", "pi", "sigma", "tau", "phi", "chi", "psi", "omega"}
)

// outcomeRead is the phases read from an outcome cell, with what was
// guessed on the way.
type outcomeRead struct {
	outcomes []meltbook.Outcome
	guesses  []string
}

// readOutcome reads an outcome cell written loosely into phase outcomes.
// Parts are separated by "+", ";", "&", " and ", " with ", or a comma not
// between digits; each part may carry a percentage (the rough volume
// fraction) and a question mark or "maybe" (tentative). where names the
// cell for the outcome's evidence.
func readOutcome(cell, where string) (outcomeRead, error) {
	var res outcomeRead
	cell = strings.TrimSpace(cell)
	if noOutcomeWords[strings.ToLower(cell)] {
		return res, nil
	}
	for _, part := range splitOutcome(cell) {
		o, guess, err := readPhase(part)
		if err != nil {
			return res, err
		}
		if guess != "" {
			res.guesses = append(res.guesses, guess)
		}
		if strings.HasPrefix(o.Evidence, Tentative) {
			o.Evidence = fmt.Sprintf("%s: %s said %q", Tentative, where, cell)
		} else {
			o.Evidence = fmt.Sprintf("%s said %q", where, cell)
		}
		res.outcomes = append(res.outcomes, o)
	}
	var sum float64
	for _, o := range res.outcomes {
		if o.Fraction != nil {
			sum += *o.Fraction
		}
	}
	if sum > 1+1e-9 {
		return res, fmt.Errorf("%q: the fractions add up to %.0f%%, more than 100%%", cell, 100*sum)
	}
	return res, nil
}

// splitOutcome splits a cell into its phase parts.
func splitOutcome(cell string) []string {
	var parts []string
	var cur strings.Builder
	rs := []rune(cell)
	flush := func() {
		if p := strings.TrimSpace(cur.String()); p != "" {
			parts = append(parts, p)
		}
		cur.Reset()
	}
	for i := 0; i < len(rs); i++ {
		r := rs[i]
		switch {
		case r == '+' || r == ';' || r == '&':
			flush()
			continue
		case r == ',' && !(i > 0 && i+1 < len(rs) && unicode.IsDigit(rs[i-1]) && unicode.IsDigit(rs[i+1])):
			flush()
			continue
		}
		rest := strings.ToLower(string(rs[i:]))
		if matched := false; r == ' ' {
			for _, w := range []string{" and ", " with ", " plus "} {
				if strings.HasPrefix(rest, w) {
					flush()
					i += len([]rune(w)) - 2
					matched = true
					break
				}
			}
			if matched {
				continue
			}
		}
		cur.WriteRune(r)
	}
	flush()
	return parts
}

// readPhase reads one part of an outcome cell.
func readPhase(part string) (meltbook.Outcome, string, error) {
	var o meltbook.Outcome
	var guesses []string
	text := part
	tentative := uncertainRE.MatchString(strings.TrimSpace(text))
	text = strings.TrimSpace(uncertainRE.ReplaceAllString(text, " "))
	if m := percentRE.FindStringSubmatch(text); m != nil {
		x, err := strconv.ParseFloat(strings.Replace(m[1], ",", ".", 1), 64)
		if err != nil || x > 100 {
			return o, "", fmt.Errorf("%q: %s%% is not a fraction", part, m[1])
		}
		f := x / 100
		o.Fraction = &f
		text = strings.TrimSpace(percentRE.ReplaceAllString(text, " "))
	}
	text = strings.Trim(strings.TrimSpace(text), "()[] ")
	if text == "" {
		return o, "", fmt.Errorf("%q names no phase", part)
	}
	low := normaliseWords(strings.NewReplacer("(", " ", ")", " ", "[", " ", "]", " ").Replace(text))
	words := strings.Fields(low)
	has := func(ws ...string) bool {
		for _, w := range ws {
			for _, x := range words {
				if x == w {
					return true
				}
			}
		}
		return false
	}
	lattice := func() string {
		switch {
		case has("f", "fci", "face", "fcc"):
			return "F"
		case has("p", "sci", "pi", "primitive", "simple"):
			return "P"
		case has("body", "bcc"):
			return "I"
		}
		return ""
	}

	order := orderRE.FindStringSubmatch(text)
	switch {
	case isAlphaAlMnSi(text):
		o.Kind, o.Order, o.Lattice = meltbook.Approximant, "1/1", "P"
		guesses = append(guesses, fmt.Sprintf("%q read as the 1/1 cubic approximant (P), as α-Al-Mn-Si is", text))
	case has("approximant", "approx", "ac") || order != nil:
		o.Kind = meltbook.Approximant
		if order == nil {
			return o, "", fmt.Errorf("%q: an approximant needs its order, e.g. approximant 1/1", part)
		}
		p, _ := strconv.Atoi(order[1])
		q, _ := strconv.Atoi(order[2])
		if p < 1 || q < 1 {
			return o, "", fmt.Errorf("%q: %s/%s is not an approximant order p/q", part, order[1], order[2])
		}
		o.Order = fmt.Sprintf("%d/%d", p, q)
		o.Lattice = lattice()
		if !has("approximant", "approx", "ac") {
			guesses = append(guesses, fmt.Sprintf("%q read as a %s cubic approximant", text, o.Order))
		}
	case has("decagonal", "dqc", "d") && !has("i", "icosahedral"):
		o.Kind = meltbook.Decagonal
	case has("icosahedral", "ico", "iqc", "i", "fci", "sci"):
		o.Kind = meltbook.Icosahedral
		o.Lattice = lattice()
	case has("qc", "quasicrystal", "quasicrystalline", "quasi"):
		o.Kind = meltbook.Icosahedral
		o.Lattice = lattice()
		guesses = append(guesses, fmt.Sprintf("%q read as icosahedral (a quasicrystal could be decagonal; write decagonal if it was)", text))
	case has("amorphous", "amorph", "glass", "glassy", "am"):
		o.Kind = meltbook.Amorphous
	case namesCrystal(text):
		o.Kind = meltbook.Crystalline
		o.Name = text
	case has("crystalline", "crystal", "intermetallic", "xtal"):
		return o, "", fmt.Errorf("%q: name the crystalline phase, e.g. λ-Al13Fe4 or β (B2)", part)
	default:
		return o, "", fmt.Errorf("%q is no phase meltbook knows: write icosahedral (i-phase, QC), decagonal, approximant 1/1, amorphous, or a crystalline phase by its Greek letter or formula (λ, β-AlFe, Al13Fe4)", part)
	}
	if tentative {
		if o.Fraction != nil {
			guesses = append(guesses, fmt.Sprintf("%q is marked uncertain, so its fraction is not kept", part))
			o.Fraction = nil
		}
		o.Evidence = Tentative
		guesses = append(guesses, fmt.Sprintf("%q kept as a tentative %s", part, o.Kind))
	}
	return o, strings.Join(guesses, "; "), nil
}

// isAlphaAlMnSi reports whether text names the α-Al-Mn-Si phase, the 1/1
// cubic approximant of the Al-Mn-Si icosahedral phase.
//
// Reference: V. Elser, C. L. Henley, Phys. Rev. Lett. 55, 2883 (1985).
func isAlphaAlMnSi(text string) bool {
	t := strings.ToLower(strings.NewReplacer("-", "", " ", "", "(", "", ")", "", ",", "").Replace(text))
	for _, a := range []string{"α", "alpha"} {
		if strings.HasPrefix(t, a+"almnsi") {
			return true
		}
	}
	return false
}

// namesCrystal reports whether text names a crystalline phase: a Greek
// letter written or spelled ("λ", "beta-AlFe"), a formula of element
// symbols ("Al13Fe4", "MgZn2", "(Al)"), a Strukturbericht type ("B2"), or a
// one-letter phase ("H phase").
func namesCrystal(text string) bool {
	first := []rune(text)[0]
	if unicode.In(first, unicode.Greek) {
		return true
	}
	low := strings.ToLower(text)
	for _, g := range greekNames {
		if strings.HasPrefix(low, g) && (len(low) == len(g) || !unicode.IsLetter(rune(low[len(g)]))) {
			return true
		}
	}
	words := strings.FieldsFunc(text, func(r rune) bool { return r == ' ' || r == '-' })
	if len(words) == 0 {
		return false
	}
	word := strings.Trim(words[0], "()")
	if strukturberichtRE.MatchString(word) {
		return true
	}
	fields := strings.Fields(low)
	if len(fields) == 0 {
		return false
	}
	switch fields[0] {
	case "fcc", "bcc", "hcp":
		return len(fields) > 1
	}
	if len(fields) == 2 && fields[1] == "phase" && len([]rune(fields[0])) == 1 && unicode.IsLetter(first) {
		return true
	}
	if unicode.IsUpper(first) {
		if _, err := composition.Parse(strings.NewReplacer("(", "", ")", "", ",", "").Replace(word)); err == nil {
			return true
		}
	}
	return false
}
