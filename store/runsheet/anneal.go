package runsheet

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"

	"meltbook"
	"meltbook/analysis/quantity"
)

// noAnnealWords are anneal cells that say the ribbon was not treated.
var noAnnealWords = map[string]bool{"no": true, "none": true, "as spun": true, "as-spun": true, "-": true, "–": true, "—": true, "n/a": true, "na": true}

var (
	annealTemperatureRE = regexp.MustCompile(`(?i)(\d+(?:[.,]\d+)?)\s*(°\s*c|degc|℃|c|k)\b`)
	annealTimeRE        = regexp.MustCompile(`(?i)(\d+(?:[.,]\d+)?)\s*(hours?|hrs?|h|minutes?|mins?|min|days?|d|s)\b`)
	// coolingWords name how an anneal ended.
	coolingWords = []string{"water quench", "ice water", "iced water", "oil quench", "quenched", "quench", "wq", "furnace cool", "furnace cooled", "fc", "air cool", "air cooled", "ac"}
)

// readAnneal reads a heat-treatment cell such as "800 °C 4 h",
// "800C/4h WQ", "4 h at 650 °C in vacuum, furnace cool" or "none". The
// temperature and the time are required; a quench or cool word becomes the
// step's cooling, any other words its atmosphere. Times in days become
// hours. nil, nil means no anneal.
func readAnneal(cell string, decimalComma bool) (*meltbook.ProcessStep, error) {
	s := strings.TrimSpace(cell)
	if noAnnealWords[strings.ToLower(s)] {
		return nil, nil
	}
	st := &meltbook.ProcessStep{Kind: meltbook.Anneal}
	rest := s
	tm := annealTemperatureRE.FindStringSubmatchIndex(rest)
	if tm == nil {
		return nil, fmt.Errorf("%q gives no anneal temperature; write e.g. 800 °C 4 h", s)
	}
	num, err := decimalPoint(rest[tm[2]:tm[3]], decimalComma)
	if err != nil {
		return nil, err
	}
	t, err := quantity.Parse(num+" "+strings.ReplaceAll(rest[tm[4]:tm[5]], " ", ""), quantity.Temperature)
	if err != nil {
		return nil, fmt.Errorf("%q: %v", s, err)
	}
	st.Params = append(st.Params, meltbook.Param{Name: "temperature", SI: t.SI, Unit: t.Unit})
	rest = rest[:tm[0]] + " " + rest[tm[1]:]

	dm := annealTimeRE.FindStringSubmatchIndex(rest)
	if dm == nil {
		return nil, fmt.Errorf("%q gives no anneal time; write e.g. 800 °C 4 h", s)
	}
	num, err = decimalPoint(rest[dm[2]:dm[3]], decimalComma)
	if err != nil {
		return nil, err
	}
	x, err := strconv.ParseFloat(num, 64)
	if err != nil || !(x > 0) {
		return nil, fmt.Errorf("%q: the anneal time must be more than zero", s)
	}
	unit := strings.ToLower(rest[dm[4]:dm[5]])
	var d quantity.Value
	switch {
	case strings.HasPrefix(unit, "d"):
		d, err = quantity.Parse(strconv.FormatFloat(24*x, 'g', -1, 64)+" h", quantity.Time)
	case strings.HasPrefix(unit, "h"):
		d, err = quantity.Parse(num+" h", quantity.Time)
	case strings.HasPrefix(unit, "m"):
		d, err = quantity.Parse(num+" min", quantity.Time)
	default:
		d, err = quantity.Parse(num+" s", quantity.Time)
	}
	if err != nil {
		return nil, fmt.Errorf("%q: %v", s, err)
	}
	st.Params = append(st.Params, meltbook.Param{Name: "time", SI: d.SI, Unit: d.Unit})
	rest = rest[:dm[0]] + " " + rest[dm[1]:]

	if annealTemperatureRE.MatchString(rest) || annealTimeRE.MatchString(rest) {
		return nil, fmt.Errorf("%q gives more than one temperature or time; log further anneals separately", s)
	}
	var words []string
	for _, w := range strings.FieldsFunc(rest, func(r rune) bool { return r == ',' || r == '/' || r == ';' || r == '+' }) {
		var kept []string
		for _, t := range strings.Fields(w) {
			switch strings.ToLower(t) {
			case "at", "for", "in", "then", "and", "under":
			default:
				kept = append(kept, t)
			}
		}
		if len(kept) > 0 {
			words = append(words, strings.Join(kept, " "))
		}
	}
	var cooling, atmosphere []string
	for _, w := range words {
		low := strings.ToLower(w)
		isCooling := false
		for _, c := range coolingWords {
			if strings.Contains(" "+low+" ", " "+c+" ") {
				isCooling = true
				break
			}
		}
		if isCooling {
			cooling = append(cooling, w)
		} else {
			atmosphere = append(atmosphere, w)
		}
	}
	if len(atmosphere) > 0 {
		st.Params = append(st.Params, meltbook.Param{Name: "atmosphere", Text: strings.Join(atmosphere, ", ")})
	}
	if len(cooling) > 0 {
		st.Params = append(st.Params, meltbook.Param{Name: "cooling", Text: strings.Join(cooling, ", ")})
	}
	return st, nil
}
