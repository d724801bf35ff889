package query

import (
	"math"
	"net/url"
	"strconv"
	"strings"
	"time"

	"meltbook"
	"meltbook/analysis/element"
)

// DefaultScheme is the valence scheme e/a is reported and filtered under
// when no scheme is given.
const DefaultScheme = element.RaynorScheme

// Field describes one filter: its name, used as the flag (--NAME) and as
// the URL query key, and the syntax of its value.
type Field struct {
	Name    string `json:"name"`
	Label   string `json:"label"`
	Help    string `json:"help"`
	Example string `json:"example"`
	// Repeatable filters may be given more than once; their values add up.
	Repeatable bool `json:"repeatable"`
}

// The filter names.
const (
	Outcome   = "outcome"
	Proposals = "proposals"
	EA        = "ea"
	Scheme    = "scheme"
	With      = "with"
	System    = "system"
	Content   = "content"
	Rate      = "rate"
	Made      = "made"
	By        = "by"
	Text      = "text"
)

var fields = []Field{
	{Outcome, "Outcome", "phase kind decided for at least one sample: icosahedral, decagonal, approximant, crystalline or amorphous; several (comma-separated or repeated) mean any of them", "icosahedral", true},
	{Proposals, "Count proposals", "yes: also count automatic proposals still awaiting a decision, on samples no person has judged", "yes", false},
	{EA, "e/a", "range MIN:MAX of the nominal e/a under the valence scheme; leave an end out for an open side (1.7: or :1.8)", "1.7:1.8", false},
	{Scheme, "Valence scheme", "valence scheme for e/a: raynor (the default) or group", "group", false},
	{With, "Contains", "elements that must all be present, others allowed; comma- or dash-separated", "Al,Cu", false},
	{System, "System", "exactly these elements and no others", "Al-Cu-Fe", false},
	{Content, "Element content", "nominal atomic percent of one element, EL=MIN:MAX; repeat for more elements", "Cu=20:30", true},
	{Rate, "Cooling rate", "range MIN:MAX of the estimated cooling rate in K/s", "1e5:1e7", false},
	{Made, "Made", "date range FROM:TO (YYYY-MM-DD, both days included); with times write FROM..TO (YYYY-MM-DDTHH:MM)", "2024-01-01:2024-06-30", false},
	{By, "Operator", "name of the operator who made the melt, exactly as recorded", "adaeze", false},
	{Text, "Text", "words in the melt's notes or in any dated note on it, ignoring case", "cracked", false},
}

// Fields lists the filters in the order forms and help show them.
func Fields() []Field { return append([]Field(nil), fields...) }

func fieldByName(name string) (Field, bool) {
	for _, f := range fields {
		if f.Name == name {
			return f, true
		}
	}
	return Field{}, false
}

// Term is one filter as typed: a name from Fields and its value.
type Term struct {
	Name  string `json:"name"`
	Value string `json:"value"`
}

// Terms picks the filter terms out of URL query values, in the order of
// Fields, skipping other keys (paging, sorting) and empty values.
func Terms(v url.Values) []Term {
	var out []Term
	for _, f := range fields {
		for _, s := range v[f.Name] {
			if strings.TrimSpace(s) != "" {
				out = append(out, Term{f.Name, s})
			}
		}
	}
	return out
}

// Options tune Parse.
type Options struct {
	// Location reads dates and times written without a zone; nil is UTC.
	Location *time.Location
}

// Parse turns filter terms into a MeltFilter. An empty value leaves its
// filter out, as an empty form field does. A filter given twice that is not
// Repeatable, an unknown name, or a value that does not read is an Invalid
// *meltbook.Error whose Field is the filter's name. The filter's Scheme is
// DefaultScheme unless a scheme term names another; the result passes
// MeltFilter.Validate.
func Parse(terms []Term, opt Options) (meltbook.MeltFilter, error) {
	loc := opt.Location
	if loc == nil {
		loc = time.UTC
	}
	f := meltbook.MeltFilter{Scheme: DefaultScheme}
	seen := map[string]bool{}
	var with, system []string
	for _, t := range terms {
		field, ok := fieldByName(t.Name)
		if !ok {
			name := t.Name
			if strings.TrimSpace(name) == "" {
				name = "filter"
			}
			return meltbook.MeltFilter{}, meltbook.Errorf(meltbook.Invalid, name, "%q is not a filter; the filters are %s", t.Name, names())
		}
		v := strings.TrimSpace(t.Value)
		if v == "" {
			continue
		}
		if seen[t.Name] && !field.Repeatable {
			return meltbook.MeltFilter{}, meltbook.Errorf(meltbook.Invalid, t.Name, "given twice; give it once")
		}
		seen[t.Name] = true
		var err error
		switch t.Name {
		case Outcome:
			err = parseOutcomes(v, &f)
		case Proposals:
			f.IncludeProposals, err = parseYesNo(t.Name, v)
		case EA:
			f.EOverA, err = parseRange(t.Name, v, 1)
		case Scheme:
			if strings.ContainsAny(v, " \t\r\n") {
				err = meltbook.Errorf(meltbook.Invalid, t.Name, "%q is not a scheme name (raynor or group)", v)
			}
			f.Scheme = v
		case With:
			with, err = parseElements(t.Name, v)
		case System:
			system, err = parseElements(t.Name, v)
		case Content:
			err = parseContent(v, &f)
		case Rate:
			f.CoolingRateKPerS, err = parseRange(t.Name, strings.TrimSpace(strings.TrimSuffix(v, "K/s")), 1)
		case Made:
			err = parseMade(v, loc, &f)
		case By:
			f.Operator = v
		case Text:
			f.Text = v
		}
		if err != nil {
			return meltbook.MeltFilter{}, err
		}
	}
	f.Elements = with
	if system != nil {
		in := map[string]bool{}
		for _, el := range system {
			in[el] = true
		}
		for _, el := range with {
			if !in[el] {
				return meltbook.MeltFilter{}, meltbook.Errorf(meltbook.Invalid, With, "%s is not in the system %s, so nothing can match", el, strings.Join(system, "-"))
			}
		}
		f.Elements, f.OnlyElements = system, true
	}
	if err := f.Validate(); err != nil {
		return meltbook.MeltFilter{}, err
	}
	return f, nil
}

func names() string {
	out := make([]string, len(fields))
	for i, f := range fields {
		out[i] = f.Name
	}
	return strings.Join(out, ", ")
}

func parseOutcomes(v string, f *meltbook.MeltFilter) error {
	for _, s := range strings.Split(v, ",") {
		k := meltbook.PhaseKind(strings.ToLower(strings.TrimSpace(s)))
		known := false
		for _, p := range meltbook.PhaseKinds {
			known = known || p == k
		}
		if !known {
			return meltbook.Errorf(meltbook.Invalid, Outcome, "%q is not a phase kind (icosahedral, decagonal, approximant, crystalline, amorphous)", strings.TrimSpace(s))
		}
		dup := false
		for _, have := range f.Outcomes {
			dup = dup || have == k
		}
		if !dup {
			f.Outcomes = append(f.Outcomes, k)
		}
	}
	return nil
}

func parseYesNo(name, v string) (bool, error) {
	switch strings.ToLower(v) {
	case "yes", "y", "true", "1", "on":
		return true, nil
	case "no", "n", "false", "0", "off":
		return false, nil
	}
	return false, meltbook.Errorf(meltbook.Invalid, name, "%q is not yes or no", v)
}

// parseRange reads MIN:MAX (either end may be empty) and scales both ends.
func parseRange(name, v string, scale float64) (*meltbook.Range, error) {
	lo, hi, ok := strings.Cut(v, ":")
	if !ok {
		return nil, meltbook.Errorf(meltbook.Invalid, name, "%q is not a range; write MIN:MAX and leave an end out for an open side (1.7: or :1.8)", v)
	}
	lo, hi = strings.TrimSpace(lo), strings.TrimSpace(hi)
	if lo == "" && hi == "" {
		return nil, meltbook.Errorf(meltbook.Invalid, name, "the range %q has no ends; give at least one", v)
	}
	r := &meltbook.Range{}
	for _, end := range []struct {
		s   string
		dst **float64
	}{{lo, &r.Min}, {hi, &r.Max}} {
		if end.s == "" {
			continue
		}
		x, err := strconv.ParseFloat(end.s, 64)
		if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
			return nil, meltbook.Errorf(meltbook.Invalid, name, "%q is not a number", end.s)
		}
		x *= scale
		*end.dst = &x
	}
	if r.Min != nil && r.Max != nil && *r.Min > *r.Max {
		return nil, meltbook.Errorf(meltbook.Invalid, name, "in %q the lower end exceeds the upper", v)
	}
	return r, nil
}

func parseElements(name, v string) ([]string, error) {
	var out []string
	for _, s := range strings.FieldsFunc(v, func(r rune) bool { return r == ',' || r == '-' || r == ' ' || r == '\t' }) {
		if _, ok := element.BySymbol(s); !ok {
			return nil, meltbook.Errorf(meltbook.Invalid, name, "%q is not an element symbol (symbols are case-sensitive: Co, not CO)", s)
		}
		dup := false
		for _, have := range out {
			dup = dup || have == s
		}
		if !dup {
			out = append(out, s)
		}
	}
	if len(out) == 0 {
		return nil, meltbook.Errorf(meltbook.Invalid, name, "no element symbols in %q", v)
	}
	return out, nil
}

func parseContent(v string, f *meltbook.MeltFilter) error {
	el, rng, ok := strings.Cut(v, "=")
	el = strings.TrimSpace(el)
	if !ok || el == "" {
		return meltbook.Errorf(meltbook.Invalid, Content, "%q is not EL=MIN:MAX, e.g. Cu=20:30 (atomic percent)", v)
	}
	if _, known := element.BySymbol(el); !known {
		return meltbook.Errorf(meltbook.Invalid, Content, "%q is not an element symbol (symbols are case-sensitive: Co, not CO)", el)
	}
	for _, fr := range f.Fractions {
		if fr.Element == el {
			return meltbook.Errorf(meltbook.Invalid, Content, "%s given twice; give one range per element", el)
		}
	}
	r, err := parseRange(Content, strings.TrimSuffix(strings.TrimSpace(rng), "%"), 0.01)
	if err != nil {
		return err
	}
	for _, end := range []*float64{r.Min, r.Max} {
		if end != nil && (*end < 0 || *end > 1) {
			return meltbook.Errorf(meltbook.Invalid, Content, "%s: atomic percent lies in 0..100", el)
		}
	}
	f.Fractions = append(f.Fractions, meltbook.FractionRange{Element: el, Range: *r})
	return nil
}

// dateLayouts are the accepted forms of a date or time, each with the span
// it names: a date covers its day, a time its minute or second.
var dateLayouts = []struct {
	layout string
	span   time.Duration
}{
	{"2006-01-02", 24 * time.Hour},
	{"2006-01-02T15:04", time.Minute},
	{"2006-01-02T15:04:05", time.Second},
}

func parseInstant(s string, loc *time.Location) (from, until time.Time, err error) {
	if t, err := time.Parse(time.RFC3339Nano, s); err == nil {
		return t, t.Add(time.Nanosecond), nil
	}
	for _, d := range dateLayouts {
		if t, err := time.ParseInLocation(d.layout, s, loc); err == nil {
			if d.span == 24*time.Hour {
				return t, t.AddDate(0, 0, 1), nil
			}
			return t, t.Add(d.span), nil
		}
	}
	return time.Time{}, time.Time{}, meltbook.Errorf(meltbook.Invalid, Made, "%q is not a date (YYYY-MM-DD) or time (YYYY-MM-DDTHH:MM)", s)
}

func parseMade(v string, loc *time.Location, f *meltbook.MeltFilter) error {
	lo, hi, ok := strings.Cut(v, "..")
	if !ok {
		if strings.Contains(v, "T") {
			return meltbook.Errorf(meltbook.Invalid, Made, "%q: with times write the range as FROM..TO", v)
		}
		lo, hi, ok = strings.Cut(v, ":")
	}
	if !ok {
		return meltbook.Errorf(meltbook.Invalid, Made, "%q is not a date range; write FROM:TO, e.g. 2024-01-01:2024-06-30, and leave an end out for an open side", v)
	}
	lo, hi = strings.TrimSpace(lo), strings.TrimSpace(hi)
	if lo == "" && hi == "" {
		return meltbook.Errorf(meltbook.Invalid, Made, "the range %q has no ends; give at least one", v)
	}
	if lo != "" {
		from, _, err := parseInstant(lo, loc)
		if err != nil {
			return err
		}
		f.CreatedFrom = &from
	}
	if hi != "" {
		_, until, err := parseInstant(hi, loc)
		if err != nil {
			return err
		}
		f.CreatedBefore = &until
	}
	if f.CreatedFrom != nil && f.CreatedBefore != nil && !f.CreatedFrom.Before(*f.CreatedBefore) {
		return meltbook.Errorf(meltbook.Invalid, Made, "in %q the start is after the end", v)
	}
	return nil
}
