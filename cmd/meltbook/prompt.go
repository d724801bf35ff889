package main

import (
	"bufio"
	"fmt"
	"io"
	"strings"

	"meltbook"
	"meltbook/analysis/quantity"
	"meltbook/store/runform"
)

// prompter asks for values on a terminal: the question goes to out, the
// answer comes from in, one line each.
type prompter struct {
	in  *bufio.Reader
	out io.Writer
}

// ask prints the question and reads one line; ok is false at the end of
// the input.
func (p *prompter) ask(question string) (answer string, ok bool) {
	fmt.Fprint(p.out, question)
	line, err := p.in.ReadString('\n')
	if err != nil && line == "" {
		fmt.Fprintln(p.out)
		return "", false
	}
	return strings.TrimSpace(line), true
}

// askField asks for one field until the answer reads or is blank (when
// blank is allowed); it returns "" for a skipped field.
func (p *prompter) askField(key, extra string, required bool) (string, error) {
	f, _ := runform.FieldByKey(key)
	question := fmt.Sprintf("%s (%s%s): ", key, f.HelpText(), extra)
	for {
		answer, ok := p.ask(question)
		if !ok {
			if required {
				return "", meltbook.Errorf(meltbook.Invalid, "--"+key, "missing, and the input ended before it was given")
			}
			return "", nil
		}
		if answer == "" {
			if !required {
				return "", nil
			}
			fmt.Fprintf(p.out, "  %s is needed.\n", key)
			continue
		}
		if err := checkField(key, answer); err != nil {
			fmt.Fprintf(p.out, "  %v\n", err)
			continue
		}
		return answer, nil
	}
}

// promptGroups are the optional parts of a run a prompt offers: a blank
// answer to a group's first field skips the group.
var promptGroups = []struct {
	title string
	keys  []string
}{
	{"the melt", []string{"code", "mass-after", "notes"}},
	{"arc melting", []string{"arc-remelts", "arc-current", "arc-atmosphere", "arc-chamber-pressure"}},
	{"melt spinning", []string{"wheel-speed", "wheel-material", "orifice", "gap", "ejection-pressure", "melt-temperature", "chamber-gas", "chamber-pressure", "thickness", "width"}},
}

// promptRun asks on the terminal for the fields of a run the command line
// left out: first the composition and mass, which a run needs, then the
// optional parts group by group.
func (a *app) promptRun(in *runform.Input) error {
	p := &prompter{in: bufio.NewReader(a.stdin), out: a.stderr}
	fmt.Fprintln(p.out, "Logging a melt. Give values with units (10g, 30um, 1250C); press Enter to skip what you do not know.")
	for _, key := range []string{"composition", "mass"} {
		if in.Has(key) {
			continue
		}
		answer, err := p.askField(key, "", true)
		if err != nil {
			return err
		}
		in.Add(key, answer, key)
	}
	for gi, g := range promptGroups {
		given := false
		for _, key := range g.keys {
			given = given || in.Has(key)
		}
		for i, key := range g.keys {
			if in.Has(key) {
				continue
			}
			extra := ""
			switch {
			case key == "code":
				extra = "; blank: the next free code"
			case i == 0 && gi > 0 && !given:
				extra = "; blank: no " + g.title
			}
			answer, err := p.askField(key, extra, false)
			if err != nil {
				return err
			}
			if answer == "" {
				if i == 0 && gi > 0 && !given {
					break
				}
				continue
			}
			in.Add(key, answer, key)
			if key == "wheel-speed" && !in.Has("wheel-diameter") && isRotationRate(answer) {
				d, err := p.askField("wheel-diameter", "", true)
				if err != nil {
					return err
				}
				in.Add("wheel-diameter", d, "wheel-diameter")
			}
		}
	}
	return nil
}

func isRotationRate(s string) bool {
	_, err := quantity.Parse(s, quantity.RotationRate)
	return err == nil
}

// checkField reads one answer on its own, so that a prompt can ask again
// at once; buildRun still checks the run as a whole.
func checkField(key, value string) error {
	v := runform.Value{Key: key, Value: value, Where: key}
	f, _ := runform.FieldByKey(key)
	switch {
	case key == "composition":
		_, err := runform.ParseComposition(v)
		return err
	case key == "mass" || key == "mass-after":
		_, err := runform.ParsePositive(v, quantity.Mass)
		return err
	case key == "wheel-diameter":
		_, err := runform.ParsePositive(v, quantity.Length)
		return err
	case key == "code":
		m := meltbook.Melt{Code: value}
		if err := m.Validate(); meltbook.KindOf(err) == meltbook.Invalid && strings.HasPrefix(err.Error(), "code") {
			return err
		}
	case key == "wheel-speed":
		if _, err := quantity.Parse(value, quantity.Speed); err == nil || isRotationRate(value) {
			return nil
		}
		return meltbook.Errorf(meltbook.Invalid, key, "%q is neither a surface speed (30m/s) nor a rotation rate (3000rpm)", value)
	case f.StepParam != "":
		spec, _ := meltbook.ParamSpecFor(f.Step, f.StepParam)
		_, err := runform.ParseParam(spec, v)
		return err
	}
	return nil
}
