package phaselib

import "strings"

// greek is the CIF 1.1 text markup for Greek letters ("\q" is θ) with the
// ASCII spelling of each letter. Reference: IUCr, CIF version 1.1 working
// specification, §5.6 "Greek letters".
var greek = []struct {
	code, letter, ascii string
}{
	{`\a`, "α", "alpha"}, {`\b`, "β", "beta"}, {`\g`, "γ", "gamma"},
	{`\d`, "δ", "delta"}, {`\e`, "ε", "epsilon"}, {`\z`, "ζ", "zeta"},
	{`\h`, "η", "eta"}, {`\q`, "θ", "theta"}, {`\i`, "ι", "iota"},
	{`\k`, "κ", "kappa"}, {`\l`, "λ", "lambda"}, {`\m`, "μ", "mu"},
	{`\n`, "ν", "nu"}, {`\x`, "ξ", "xi"}, {`\p`, "π", "pi"},
	{`\r`, "ρ", "rho"}, {`\s`, "σ", "sigma"}, {`\t`, "τ", "tau"},
	{`\f`, "φ", "phi"}, {`\c`, "χ", "chi"}, {`\y`, "ψ", "psi"},
	{`\w`, "ω", "omega"},
}

// DisplayName turns the CIF markup of a phase name into the letters:
// `\q-Al2Cu` → "θ-Al2Cu". A name without markup is returned unchanged.
func DisplayName(s string) string {
	s = strings.TrimSpace(s)
	for _, g := range greek {
		s = strings.ReplaceAll(s, g.code, g.letter)
	}
	return s
}

// ASCIIName spells the Greek letters of a name (in markup or as letters)
// out: "θ-Al2Cu" and `\q-Al2Cu` → "theta-Al2Cu". Capital markup (\Q) is
// not used in phase names and is left alone.
func ASCIIName(s string) string {
	s = strings.TrimSpace(s)
	for _, g := range greek {
		s = strings.ReplaceAll(s, g.code, g.ascii)
		s = strings.ReplaceAll(s, g.letter, g.ascii)
	}
	return strings.ReplaceAll(s, "′", "'")
}
