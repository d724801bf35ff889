package store

import (
	"context"
	"database/sql"
	"fmt"
	"math"
	"sort"
	"strings"

	"meltbook"
)

// FindMelts returns the melts matching f, one page of them as f.Limit and
// f.Offset say, and the number of all matching melts. See
// meltbook.MeltFilter for what each field selects.
//
// Every condition is answered in SQL, including e/a under a user's own
// valence table, so paging and the total stay exact.
func (s *Store) FindMelts(ctx context.Context, f meltbook.MeltFilter) ([]meltbook.MeltSummary, int, error) {
	if err := f.Validate(); err != nil {
		return nil, 0, err
	}
	q, err := buildFind(&f)
	if err != nil {
		return nil, 0, err
	}
	var rows []meltbook.MeltSummary
	total := 0
	err = s.read(ctx, func(t *txn) error {
		var err error
		if rows, total, err = t.findPage(q, &f); err != nil {
			return err
		}
		// The page counts all matches; a page past the end has no row to
		// carry the count.
		if len(rows) == 0 && f.Offset > 0 {
			if err := t.queryRow(q.count, q.countArgs...).Scan(&total); err != nil {
				return fmt.Errorf("count melts: %w", err)
			}
		}
		return nil
	})
	if err != nil {
		return nil, 0, fmt.Errorf("find melts: %w", err)
	}
	return rows, total, nil
}

// findQuery is a FindMelts search turned into SQL.
type findQuery struct {
	count     string
	countArgs []any
	page      string
	pageArgs  []any
}

// sqlExpr is an SQL fragment with its arguments in order.
type sqlExpr struct {
	sql  string
	args []any
}

// eOverAExpr is the SQL expression for a melt m's e/a under the filter's
// scheme: a stored column for a kept scheme, or for a user's valence table
//
//	Σ x·v over the melt's elements with x > 0, NULL if one has no valence,
//
// the same rule the stored columns follow.
func eOverAExpr(f *meltbook.MeltFilter) (sqlExpr, error) {
	switch {
	case f.Valences != nil:
		if len(f.Valences) == 0 {
			return sqlExpr{sql: "NULL"}, nil
		}
		elements := make([]string, 0, len(f.Valences))
		for el := range f.Valences {
			elements = append(elements, el)
		}
		sort.Strings(elements)
		var cs strings.Builder
		var args []any
		cs.WriteString("CASE e.element")
		for _, el := range elements {
			cs.WriteString(" WHEN ? THEN ?")
			args = append(args, el, f.Valences[el])
		}
		cs.WriteString(" END")
		return sqlExpr{
			sql: "(SELECT CASE WHEN COUNT(*) = COUNT(" + cs.String() + ") THEN SUM(e.fraction * " + cs.String() + ") END" +
				" FROM melt_element e WHERE e.melt_id = m.id AND e.fraction > 0)",
			args: append(append([]any{}, args...), args...),
		}, nil
	case f.Scheme == "":
		return sqlExpr{sql: "NULL"}, nil
	case isKept(f.Scheme):
		return sqlExpr{sql: "m.e_over_a_" + f.Scheme}, nil
	}
	return sqlExpr{}, meltbook.Errorf(invalid, "scheme", "the notebook keeps e/a for %s only; for scheme %q give its valence table",
		strings.Join(KeptSchemes, " and "), f.Scheme)
}

func placeholders(n int) string {
	return strings.TrimSuffix(strings.Repeat("?, ", n), ", ")
}

// rangeConds adds expr's range conditions; a range with no ends only asks
// for a value. A closed range is one BETWEEN, which evaluates expr once.
func rangeConds(expr sqlExpr, r *meltbook.Range, where *[]sqlExpr) {
	switch {
	case r.Min == nil && r.Max == nil:
		*where = append(*where, sqlExpr{sql: expr.sql + " IS NOT NULL", args: expr.args})
		return
	case r.Min != nil && r.Max != nil:
		*where = append(*where, sqlExpr{sql: expr.sql + " BETWEEN ? AND ?", args: append(append([]any{}, expr.args...), *r.Min, *r.Max)})
		return
	}
	if r.Min != nil {
		*where = append(*where, sqlExpr{sql: expr.sql + " >= ?", args: append(append([]any{}, expr.args...), *r.Min)})
	}
	if r.Max != nil {
		*where = append(*where, sqlExpr{sql: expr.sql + " <= ?", args: append(append([]any{}, expr.args...), *r.Max)})
	}
}

// asciiLower folds ASCII letters only, as SQLite's LOWER does.
func asciiLower(s string) string {
	b := []byte(s)
	for i, c := range b {
		if 'A' <= c && c <= 'Z' {
			b[i] = c + ('a' - 'A')
		}
	}
	return string(b)
}

// likePattern makes a LIKE pattern matching text anywhere, with '\' as
// the escape character.
func likePattern(text string) string {
	return "%" + likeEscaper.Replace(asciiLower(text)) + "%"
}

var likeEscaper = strings.NewReplacer(`\`, `\\`, `%`, `\%`, `_`, `\_`)

func buildFind(f *meltbook.MeltFilter) (*findQuery, error) {
	ea, err := eOverAExpr(f)
	if err != nil {
		return nil, err
	}
	var where []sqlExpr
	add := func(sql string, args ...any) { where = append(where, sqlExpr{sql, args}) }

	if len(f.Outcomes) > 0 {
		args := make([]any, len(f.Outcomes))
		for i, k := range f.Outcomes {
			args[i] = string(k)
		}
		standing := "o.source = 'person' OR o.status = 'confirmed'"
		if f.IncludeProposals {
			standing += ` OR (o.status = 'proposed' AND NOT EXISTS (
				SELECT 1 FROM outcome p WHERE p.sample_id = o.sample_id AND p.source = 'person'))`
		}
		add(`m.id IN (SELECT sa.melt_id FROM outcome o JOIN sample sa ON sa.id = o.sample_id
			WHERE o.kind IN (`+placeholders(len(args))+`) AND (`+standing+`))`, args...)
	}
	if f.OnlyElements {
		// All of these and no others: exactly this set.
		set := make([]meltbook.ElementFraction, len(f.Elements))
		for i, el := range f.Elements {
			set[i] = meltbook.ElementFraction{Element: el, Fraction: 1}
		}
		add(`m.element_set = ?`, elementSet(set))
	} else {
		for _, el := range f.Elements {
			add(`m.element_set LIKE ? ESCAPE '\'`, "%,"+likeEscaper.Replace(el)+",%")
		}
	}
	for _, fr := range f.Fractions {
		lo, hi := 0.0, 1.0
		if fr.Min != nil {
			lo = *fr.Min
		}
		if fr.Max != nil {
			hi = *fr.Max
		}
		if lo > 0 {
			// The element must be there: search the (element, fraction) index.
			add(`m.id IN (SELECT melt_id FROM melt_element WHERE element = ? AND fraction >= ? AND fraction <= ?)`, fr.Element, lo, hi)
		} else {
			// A melt without the element has fraction 0, inside the range.
			add(`NOT EXISTS (SELECT 1 FROM melt_element e WHERE e.melt_id = m.id AND e.element = ?
				AND (e.fraction < ? OR e.fraction > ?))`, fr.Element, lo, hi)
		}
	}
	if f.EOverA != nil {
		rangeConds(ea, f.EOverA, &where)
	}
	if f.CoolingRateKPerS != nil {
		rangeConds(sqlExpr{sql: "m.cooling_rate_k_per_s"}, f.CoolingRateKPerS, &where)
	}
	if f.CreatedFrom != nil {
		add(`m.created_at >= ?`, formatTime(*f.CreatedFrom))
	}
	if f.CreatedBefore != nil {
		add(`m.created_at < ?`, formatTime(*f.CreatedBefore))
	}
	if f.Operator != "" {
		add(`m.operator = ?`, f.Operator)
	}
	if f.Text != "" {
		p := likePattern(f.Text)
		add(`(LOWER(m.notes) LIKE ? ESCAPE '\' OR m.id IN (SELECT melt_id FROM note WHERE LOWER(body) LIKE ? ESCAPE '\'))`, p, p)
	}

	var cond strings.Builder
	var condArgs []any
	for i, w := range where {
		if i == 0 {
			cond.WriteString(" WHERE ")
		} else {
			cond.WriteString(" AND ")
		}
		cond.WriteString(w.sql)
		condArgs = append(condArgs, w.args...)
	}

	dir := " ASC"
	if f.Descending {
		dir = " DESC"
	}
	order := sqlExpr{sql: "m.created_at"}
	switch f.Sort {
	case meltbook.SortCode:
		order = sqlExpr{sql: "m.code"}
	case meltbook.SortEOverA:
		order = ea
	case meltbook.SortCoolingRate:
		order = sqlExpr{sql: "m.cooling_rate_k_per_s"}
	}
	limit := int64(math.MaxInt64)
	if f.Limit > 0 {
		limit = int64(f.Limit)
	}

	q := &findQuery{
		count:     "SELECT COUNT(*) FROM melt m" + cond.String(),
		countArgs: condArgs,
		page: "SELECT m.id, m.code, m.created_at, m.operator, " + ea.sql + ", m.cooling_rate_k_per_s, COUNT(*) OVER () FROM melt m" +
			cond.String() + " ORDER BY " + order.sql + dir + " NULLS LAST, m.code ASC LIMIT ? OFFSET ?",
	}
	q.pageArgs = append(q.pageArgs, ea.args...)
	q.pageArgs = append(q.pageArgs, condArgs...)
	q.pageArgs = append(q.pageArgs, order.args...)
	q.pageArgs = append(q.pageArgs, limit, int64(f.Offset))
	return q, nil
}

// findChunk bounds the number of ids in one IN list.
const findChunk = 500

// findPage returns one page of matches and the number of all matches.
func (t *txn) findPage(q *findQuery, f *meltbook.MeltFilter) (out []meltbook.MeltSummary, total int, err error) {
	rows, err := t.query(q.page, q.pageArgs...)
	if err != nil {
		return nil, 0, err
	}
	var ids []int64
	for rows.Next() {
		var r meltbook.MeltSummary
		var id int64
		var created string
		var ea, cooling sql.NullFloat64
		if err := rows.Scan(&id, &r.Code, &created, &r.Operator, &ea, &cooling, &total); err != nil {
			rows.Close()
			return nil, 0, err
		}
		if r.CreatedAt, err = parseTime(created); err != nil {
			rows.Close()
			return nil, 0, err
		}
		r.Scheme = f.Scheme
		r.EOverA, r.CoolingRateKPerS = floatPtr(ea), floatPtr(cooling)
		r.Outcomes = []meltbook.Outcome{}
		out = append(out, r)
		ids = append(ids, id)
	}
	rows.Close()
	if err := rows.Err(); err != nil {
		return nil, 0, err
	}
	index := make(map[int64]int, len(ids))
	for i, id := range ids {
		index[id] = i
	}
	shown := "o.source = 'person' OR o.status = 'confirmed'"
	if f.IncludeProposals {
		shown += " OR o.status = 'proposed'"
	}
	for start := 0; start < len(ids); start += findChunk {
		chunk := ids[start:min(start+findChunk, len(ids))]
		args := make([]any, len(chunk))
		for i, id := range chunk {
			args[i] = id
		}
		in := placeholders(len(chunk))
		rows, err := t.query(`SELECT melt_id, element, fraction FROM melt_element WHERE melt_id IN (`+in+`)
			ORDER BY melt_id, position`, args...)
		if err != nil {
			return nil, 0, err
		}
		for rows.Next() {
			var id int64
			var ef meltbook.ElementFraction
			if err := rows.Scan(&id, &ef.Element, &ef.Fraction); err != nil {
				rows.Close()
				return nil, 0, err
			}
			r := &out[index[id]]
			r.Nominal = append(r.Nominal, ef)
		}
		rows.Close()
		if err := rows.Err(); err != nil {
			return nil, 0, err
		}
		rows, err = t.query(`SELECT `+outcomeColumns+`, sa.melt_id FROM outcome o JOIN sample sa ON sa.id = o.sample_id
			WHERE sa.melt_id IN (`+in+`) AND (`+shown+`) ORDER BY sa.melt_id, `+outcomeRank+`, sa.id, o.id`, args...)
		if err != nil {
			return nil, 0, err
		}
		for rows.Next() {
			var id int64
			o, err := scanOutcome(scanPrefix{rows, &id})
			if err != nil {
				rows.Close()
				return nil, 0, err
			}
			r := &out[index[id]]
			r.Outcomes = append(r.Outcomes, *o)
		}
		rows.Close()
		if err := rows.Err(); err != nil {
			return nil, 0, err
		}
	}
	return out, total, nil
}
