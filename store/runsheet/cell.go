package runsheet

import (
	"fmt"
	"strconv"
	"strings"
	"time"
	"unicode"
)

// blankWords are cells that mean "nothing recorded".
var blankWords = map[string]bool{"-": true, "–": true, "—": true, "n/a": true, "na": true, "?": true, "none": true, "nil": true}

// isBlank reports whether a cell holds nothing, or a dash or n/a.
func isBlank(s string) bool {
	s = strings.TrimSpace(s)
	return s == "" || blankWords[strings.ToLower(s)]
}

// decimalPoint rewrites the decimal comma of a number as a point when the
// sheet allows decimal commas (it is not comma-separated). A comma in a
// comma-separated sheet, a comma beside a point, or two commas are errors:
// each leaves the number in doubt.
func decimalPoint(s string, decimalComma bool) (string, error) {
	n := strings.Count(s, ",")
	if n == 0 {
		return s, nil
	}
	if !decimalComma {
		return s, fmt.Errorf("%q has a comma; in a comma-separated sheet write the decimal mark as a point", s)
	}
	if n > 1 || strings.Contains(s, ".") {
		return s, fmt.Errorf("%q has a thousands separator or two decimal marks; write the number plainly, e.g. 1234,5", s)
	}
	return strings.Replace(s, ",", ".", 1), nil
}

// isPlainNumber reports whether s is a number without a unit.
func isPlainNumber(s string) bool {
	_, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
	return err == nil
}

// DateOrder says how a date written with slashes or dashes and the year
// last, such as 03/04/2026, is read.
type DateOrder int

const (
	// DateOrderFromSheet reads such dates in the order the sheet's other
	// dates show (a day above 12 settles it); when they show none, or
	// contradict each other, a date that could be either is refused.
	DateOrderFromSheet DateOrder = iota
	// DayFirst reads 03/04/2026 as 3 April 2026.
	DayFirst
	// MonthFirst reads 03/04/2026 as 4 March 2026.
	MonthFirst
)

// String returns "day/month" or "month/day", or "from the sheet".
func (o DateOrder) String() string {
	switch o {
	case DayFirst:
		return "day/month"
	case MonthFirst:
		return "month/day"
	}
	return "from the sheet"
}

var monthNames = map[string]time.Month{
	"jan": 1, "january": 1, "feb": 2, "february": 2, "mar": 3, "march": 3, "apr": 4, "april": 4,
	"may": 5, "jun": 6, "june": 6, "jul": 7, "july": 7, "aug": 8, "august": 8, "sep": 9, "sept": 9,
	"september": 9, "oct": 10, "october": 10, "nov": 11, "november": 11, "dec": 12, "december": 12,
}

// dateParts is a date cell split up before the day/month order is known.
type dateParts struct {
	year, a, b   int  // a and b are day and month in some order
	fixed        bool // a is the day and b the month for certain
	twoDigitYear bool
	hour, minute int
	second       int
	timeGiven    bool
}

// splitDate reads the forms a date takes in sheets:
//
//	2026-03-14, 2026/03/14                 ISO order, year first
//	14.03.2026, 14.03.26                   dotted: always day first
//	14/03/2026, 03/14/2026, 14-03-2026     year last: day/month order decided later
//	14 Mar 2026, 14-Mar-26, Mar 14, 2026   with an English month name
//
// each optionally followed by a time, HH:MM or HH:MM:SS (ISO also with T).
// Two-digit years are 2000-2099. A bare number of five digits is a
// spreadsheet day count, refused with advice.
func splitDate(s string) (dateParts, error) {
	var p dateParts
	s = strings.TrimSpace(s)
	if len(s) == 5 && isPlainNumber(s) {
		return p, fmt.Errorf("%q looks like a spreadsheet day number; format the column as a date (e.g. YYYY-MM-DD) before saving the sheet", s)
	}
	if len(s) >= 11 && s[4] == '-' && (s[10] == 'T' || s[10] == 't') {
		s = s[:10] + " " + s[11:]
	}
	datePart, timePart := s, ""
	if i := strings.IndexByte(s, ':'); i >= 0 {
		j := strings.LastIndexAny(s[:i], " ")
		if j < 0 {
			return p, fmt.Errorf("%q is not a date", s)
		}
		datePart, timePart = strings.TrimSpace(s[:j]), strings.TrimSpace(s[j+1:])
	}
	if timePart != "" {
		var err error
		if p.hour, p.minute, p.second, err = splitClock(timePart); err != nil {
			return p, fmt.Errorf("%q: %v", s, err)
		}
		p.timeGiven = true
	}
	var tokens []string
	var seps []rune
	cur := strings.Builder{}
	flush := func() {
		if cur.Len() > 0 {
			tokens = append(tokens, cur.String())
			cur.Reset()
		}
	}
	for _, r := range datePart {
		switch {
		case unicode.IsDigit(r) || unicode.IsLetter(r):
			if cur.Len() > 0 && unicode.IsDigit(r) != unicode.IsDigit(rune(cur.String()[0])) {
				flush()
			}
			cur.WriteRune(r)
		case r == '.' || r == '/' || r == '-' || r == ',' || r == ' ':
			flush()
			if r != ' ' && r != ',' {
				seps = append(seps, r)
			}
		default:
			return p, fmt.Errorf("%q is not a date", s)
		}
	}
	flush()
	if len(tokens) != 3 {
		return p, fmt.Errorf("%q is not a date; write e.g. 2026-03-14", s)
	}
	month := -1
	for i, t := range tokens {
		if m, ok := monthNames[strings.ToLower(t)]; ok {
			if month >= 0 {
				return p, fmt.Errorf("%q has two month names", s)
			}
			month = i
			p.b = int(m)
		} else if !isDigits(t) {
			return p, fmt.Errorf("%q is not a date: %q is neither a number nor a month", s, t)
		}
	}
	num := func(t string) int { n, _ := strconv.Atoi(t); return n }
	switch {
	case month >= 0:
		var nums []string
		for i, t := range tokens {
			if i != month {
				nums = append(nums, t)
			}
		}
		switch {
		case len(nums[0]) == 4:
			p.year, p.a = num(nums[0]), num(nums[1])
		default:
			p.a, p.year = num(nums[0]), num(nums[1])
			p.twoDigitYear = len(nums[1]) <= 2
		}
		p.fixed = true
	case len(tokens[0]) == 4:
		p.year, p.b, p.a, p.fixed = num(tokens[0]), num(tokens[1]), num(tokens[2]), true
	case len(tokens[2]) == 4 || len(tokens[2]) == 2:
		p.a, p.b, p.year = num(tokens[0]), num(tokens[1]), num(tokens[2])
		p.twoDigitYear = len(tokens[2]) == 2
		p.fixed = len(seps) > 0 && seps[0] == '.'
	default:
		return p, fmt.Errorf("%q is not a date; write e.g. 2026-03-14", s)
	}
	if p.twoDigitYear {
		p.year += 2000
	}
	return p, nil
}

func isDigits(s string) bool {
	for _, r := range s {
		if r < '0' || r > '9' {
			return false
		}
	}
	return s != ""
}

func splitClock(s string) (h, m, sec int, err error) {
	parts := strings.Split(s, ":")
	if len(parts) < 2 || len(parts) > 3 {
		return 0, 0, 0, fmt.Errorf("%q is not a time of day HH:MM", s)
	}
	vals := make([]int, 3)
	for i, part := range parts {
		if !isDigits(part) || len(part) > 2 {
			return 0, 0, 0, fmt.Errorf("%q is not a time of day HH:MM", s)
		}
		vals[i], _ = strconv.Atoi(part)
	}
	if vals[0] > 23 || vals[1] > 59 || vals[2] > 59 {
		return 0, 0, 0, fmt.Errorf("%q is not a time of day HH:MM", s)
	}
	return vals[0], vals[1], vals[2], nil
}

// ambiguous reports whether the day/month order of p is open: not fixed
// by the form and both numbers could be a month.
func (p dateParts) ambiguous() bool {
	return !p.fixed && p.a <= 12 && p.b <= 12 && p.a != p.b
}

// evidence returns the order p's numbers prove (a day above 12), or
// DateOrderFromSheet when they prove none.
func (p dateParts) evidence() DateOrder {
	if p.fixed {
		return DateOrderFromSheet
	}
	switch {
	case p.a > 12 && p.b <= 12:
		return DayFirst
	case p.b > 12 && p.a <= 12:
		return MonthFirst
	}
	return DateOrderFromSheet
}

// date builds the time, reading open dates in order.
func (p dateParts) date(order DateOrder, loc *time.Location) (time.Time, error) {
	day, month := p.a, p.b
	if !p.fixed {
		switch {
		case p.a > 12 && p.b > 12:
			return time.Time{}, fmt.Errorf("neither %d nor %d is a month", p.a, p.b)
		case p.a > 12:
		case p.b > 12:
			day, month = p.b, p.a
		case p.a == p.b:
		case order == MonthFirst:
			day, month = p.b, p.a
		case order != DayFirst:
			return time.Time{}, fmt.Errorf("%02d/%02d could be day/month or month/day", p.a, p.b)
		}
	}
	if month < 1 || month > 12 {
		return time.Time{}, fmt.Errorf("%d is not a month", month)
	}
	t := time.Date(p.year, time.Month(month), day, p.hour, p.minute, p.second, 0, loc)
	if t.Day() != day || p.year < 1900 || p.year > 2999 {
		return time.Time{}, fmt.Errorf("no such day: %d-%02d-%02d", p.year, month, day)
	}
	return t, nil
}
