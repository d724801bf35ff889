package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"github.com/spf13/cobra"

	"meltbook"
	"meltbook/analysis/element"
	"meltbook/store"
	"meltbook/store/query"
)

func init() {
	addCommand(newFindCommand)
	addCommand(newListCommand)
}

// findSorts maps the --sort names to the store's orders.
var findSorts = map[string]meltbook.MeltSort{
	"made": meltbook.SortCreated, "code": meltbook.SortCode, "ea": meltbook.SortEOverA, "rate": meltbook.SortCoolingRate,
}

func newFindCommand(a *app) *cobra.Command {
	var (
		asJSON, asCSV, desc bool
		sortBy              string
		limit               int
	)
	cmd := &cobra.Command{
		Use:   "find [--outcome KIND] [--ea MIN:MAX] [filters]",
		Short: "Find melts by outcome, e/a, elements, content, cooling rate, date, operator or text",
		Long: `Lists the melts that match every filter given (filters combine with AND;
the values of a repeated --outcome combine with OR). The web page's
/api/find takes the same names as query keys (outcome=icosahedral&ea=1.7:1.8)
and answers with the same JSON.

Filters:
` + filterHelp() + `
Output is a table, or --csv, or --json: a list of objects with code,
created_at, operator, composition, atomic_fractions, scheme, e_over_a,
cooling_rate_K_s and outcomes (each with sample, kind, lattice, order, name,
fraction, source, status).`,
		Args: exactArgs(0, "no arguments"),
		RunE: func(cmd *cobra.Command, _ []string) error {
			if asJSON && asCSV {
				return invalidFlag("--json", "choose --json or --csv, not both")
			}
			f, err := filterFromFlags(cmd)
			if err != nil {
				return err
			}
			if sortBy != "" {
				s, ok := findSorts[sortBy]
				if !ok {
					return invalidFlag("--sort", fmt.Sprintf("%q is not made, code, ea or rate", sortBy))
				}
				f.Sort = s
			}
			if limit < 0 {
				return invalidFlag("--limit", "must not be negative")
			}
			f.Descending, f.Limit = desc, limit
			rows, total, err := a.findRows(cmd.Context(), f)
			if err != nil {
				return err
			}
			switch {
			case asJSON:
				return writeJSON(a.stdout, rows)
			case asCSV:
				return query.WriteCSV(a.stdout, rows)
			}
			return printRows(a.stdout, rows, total, true)
		},
	}
	fl := cmd.Flags()
	for _, qf := range query.Fields() {
		help := qf.Help + ", e.g. " + qf.Example
		if qf.Repeatable {
			fl.StringArray(qf.Name, nil, help)
		} else {
			fl.String(qf.Name, "", help)
		}
	}
	fl.StringVar(&sortBy, "sort", "made", "order: made, code, ea or rate")
	fl.BoolVar(&desc, "desc", false, "reverse the order")
	fl.IntVar(&limit, "limit", 0, "show at most this many melts (0: all)")
	fl.BoolVar(&asJSON, "json", false, "print JSON")
	fl.BoolVar(&asCSV, "csv", false, "print CSV")
	return cmd
}

func filterHelp() string {
	var b strings.Builder
	for _, f := range query.Fields() {
		fmt.Fprintf(&b, "  --%-10s %s (e.g. %s)\n", f.Name, f.Help, f.Example)
	}
	return b.String()
}

// filterFromFlags reads the filter flags through the shared parser, and
// resolves a --scheme that names a scheme file into its valence table.
func filterFromFlags(cmd *cobra.Command) (meltbook.MeltFilter, error) {
	var terms []query.Term
	fl := cmd.Flags()
	for _, qf := range query.Fields() {
		if !fl.Changed(qf.Name) {
			continue
		}
		if qf.Repeatable {
			vs, _ := fl.GetStringArray(qf.Name)
			for _, v := range vs {
				terms = append(terms, query.Term{Name: qf.Name, Value: v})
			}
			continue
		}
		v, _ := fl.GetString(qf.Name)
		terms = append(terms, query.Term{Name: qf.Name, Value: v})
	}
	f, err := query.Parse(terms, query.Options{Location: time.Local})
	if err != nil {
		var e *meltbook.Error
		if errors.As(err, &e) && e.Field != "" {
			return f, &meltbook.Error{Kind: e.Kind, Field: "--" + e.Field, Message: e.Message}
		}
		return f, err
	}
	if !hasString(store.KeptSchemes, f.Scheme) {
		s, err := element.LoadScheme(f.Scheme)
		if err != nil {
			return f, invalidFlag("--scheme", fmt.Sprintf("%v (the notebook keeps e/a under %s; other schemes come from a scheme file)", err, strings.Join(store.KeptSchemes, " and ")))
		}
		f.Scheme, f.Valences = s.Name, s.Valence
	}
	return f, nil
}

// findRows runs a search and builds the rows to print.
func (a *app) findRows(ctx context.Context, f meltbook.MeltFilter) ([]query.Row, int, error) {
	st, err := a.openNotebook(ctx)
	if err != nil {
		return nil, 0, err
	}
	defer st.Close()
	found, total, err := st.FindMelts(ctx, f)
	if err != nil {
		var e *meltbook.Error
		if errors.As(err, &e) && e.Kind == meltbook.Invalid && e.Field != "" && !strings.HasPrefix(e.Field, "--") {
			return nil, 0, &meltbook.Error{Kind: e.Kind, Field: "--" + e.Field, Message: e.Message}
		}
		return nil, 0, err
	}
	return query.Rows(found), total, nil
}

// printRows writes rows as a table; wide adds e/a and the cooling rate.
func printRows(w io.Writer, rows []query.Row, total int, wide bool) error {
	if len(rows) == 0 {
		fmt.Fprintln(w, "no melts match")
		return nil
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	if wide {
		fmt.Fprintf(tw, "code\tmade\toperator\tcomposition\te/a (%s)\tcooling rate\toutcomes\n", rows[0].Scheme)
	} else {
		fmt.Fprintln(tw, "code\tmade\toperator\tcomposition\toutcomes")
	}
	for _, r := range rows {
		outcomes := make([]string, len(r.Outcomes))
		for i, o := range r.Outcomes {
			outcomes[i] = o.String()
		}
		oc := strings.Join(outcomes, "; ")
		if oc == "" {
			oc = "-"
		}
		if !wide {
			fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\n", r.Code, shownAt(r.CreatedAt), r.Operator, r.Composition, oc)
			continue
		}
		ea, rate := "-", "-"
		if r.EOverA != nil {
			ea = strconv.FormatFloat(*r.EOverA, 'f', 3, 64)
		}
		if r.CoolingRateKPerS != nil {
			rate = strconv.FormatFloat(*r.CoolingRateKPerS, 'g', 3, 64) + " K/s"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t%s\n", r.Code, shownAt(r.CreatedAt), r.Operator, r.Composition, ea, rate, oc)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	if total > len(rows) {
		fmt.Fprintf(w, "%d of %d melts\n", len(rows), total)
	} else if total == 1 {
		fmt.Fprintln(w, "1 melt")
	} else {
		fmt.Fprintf(w, "%d melts\n", total)
	}
	return nil
}

func newListCommand(a *app) *cobra.Command {
	var (
		asJSON, newest bool
		limit          int
	)
	cmd := &cobra.Command{
		Use:   "list",
		Short: "List the melts in the notebook, in the order they were made",
		Args:  exactArgs(0, "no arguments"),
		RunE: func(cmd *cobra.Command, _ []string) error {
			if limit < 0 {
				return invalidFlag("--limit", "must not be negative")
			}
			f := meltbook.MeltFilter{Scheme: query.DefaultScheme, Descending: newest, Limit: limit}
			rows, total, err := a.findRows(cmd.Context(), f)
			if err != nil {
				return err
			}
			if asJSON {
				return writeJSON(a.stdout, rows)
			}
			return printRows(a.stdout, rows, total, false)
		},
	}
	fl := cmd.Flags()
	fl.BoolVar(&newest, "newest", false, "newest first")
	fl.IntVar(&limit, "limit", 0, "show at most this many melts (0: all)")
	fl.BoolVar(&asJSON, "json", false, "print JSON (the same rows as find --json)")
	return cmd
}
