package scanfile_test

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"meltbook/analysis/scanfile"
)

func readFile(t *testing.T, name string) (scanfile.Scan, error) {
	t.Helper()
	data, err := os.ReadFile(filepath.Join("testdata", name))
	if err != nil {
		t.Fatal(err)
	}
	return scanfile.Read(name, bytes.NewReader(data))
}

// The good files hold 30 points from 20.00° by 0.02°; the row at 20.30°
// has intensity 920 (written into the files by hand-checked generation,
// see the file text).
func TestReadGoodFiles(t *testing.T) {
	cases := []struct {
		file      string
		format    scanfile.Format
		header    []string
		esdAt920  float64 // 0: no uncertainties
		anode     string
		waves     []scanfile.Wavelength
		itemKey   string
		itemValue string
	}{
		{file: "good.xy", format: scanfile.FormatXY,
			header: []string{"! invented scan: Tarn Hollow group, ribbon TH-041, Cu tube", "2Theta   Counts", "# step 0.02 deg"}},
		{file: "good_comma.csv", format: scanfile.FormatXY, header: []string{"angle_2theta,intensity"}},
		{file: "good_semicolon.csv", format: scanfile.FormatXY, header: []string{"2Theta;Intensity"}},
		{file: "good.xye", format: scanfile.FormatXYE, header: []string{"# 2theta intensity esd"}, esdAt920: 30.33},
		{file: "good.cif", format: scanfile.FormatPowderCIF, esdAt920: 30, anode: "Cu",
			waves:   []scanfile.Wavelength{{Angstrom: 1.5405929, Weight: 1}, {Angstrom: 1.5444274, Weight: 0.5}},
			itemKey: "_diffrn_radiation_type", itemValue: `Cu K\a`},
		{file: "good_range.cif", format: scanfile.FormatPowderCIF, anode: "Co",
			waves:   []scanfile.Wavelength{{Angstrom: 1.7889960}},
			itemKey: "_pd_meas_2theta_range_inc", itemValue: "0.02"},
	}
	for _, c := range cases {
		t.Run(c.file, func(t *testing.T) {
			s, err := readFile(t, c.file)
			if err != nil {
				t.Fatal(err)
			}
			if s.Format != c.format {
				t.Errorf("format %v, want %v", s.Format, c.format)
			}
			if s.Len() != 30 || len(s.Counts) != 30 {
				t.Fatalf("%d points, want 30", s.Len())
			}
			for i, x := range s.TwoThetaDeg {
				if want := 20 + 0.02*float64(i); math.Abs(x-want) > 1e-9 {
					t.Fatalf("2θ[%d] = %v, want %v", i, x, want)
				}
			}
			if s.Counts[0] != 120 || s.Counts[15] != 920 {
				t.Errorf("counts[0], counts[15] = %v, %v; want 120, 920", s.Counts[0], s.Counts[15])
			}
			if c.esdAt920 == 0 && s.Errors != nil {
				t.Errorf("Errors = %v, want nil", s.Errors[:3])
			}
			if c.esdAt920 != 0 && (len(s.Errors) != 30 || s.Errors[15] != c.esdAt920) {
				t.Errorf("Errors[15] wrong: %v, want %v", s.Errors, c.esdAt920)
			}
			if fmt.Sprint(s.Header) != fmt.Sprint(c.header) {
				t.Errorf("header %q, want %q", s.Header, c.header)
			}
			if s.Anode != c.anode || fmt.Sprint(s.Wavelengths) != fmt.Sprint(c.waves) {
				t.Errorf("anode %q waves %v, want %q %v", s.Anode, s.Wavelengths, c.anode, c.waves)
			}
			if c.itemKey != "" && s.Items[c.itemKey] != c.itemValue {
				t.Errorf("item %s = %q, want %q", c.itemKey, s.Items[c.itemKey], c.itemValue)
			}
			raw, _ := os.ReadFile(filepath.Join("testdata", c.file))
			if !bytes.Equal(s.Raw, raw) {
				t.Error("Raw differs from the file bytes")
			}
			sum, err := scanfile.Sum(bytes.NewReader(raw))
			if err != nil || sum != s.SHA256() || len(sum) != 64 {
				t.Errorf("Sum %q, SHA256 %q", sum, s.SHA256())
			}
		})
	}
}

func TestSHA256KnownValue(t *testing.T) {
	// SHA-256("abc") from FIPS 180-2, Appendix B.1.
	const want = "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
	if got, _ := scanfile.Sum(strings.NewReader("abc")); got != want {
		t.Errorf("Sum(abc) = %s, want %s", got, want)
	}
	if got := (scanfile.Scan{Raw: []byte("abc")}).SHA256(); got != want {
		t.Errorf("SHA256() = %s", got)
	}
}

func TestReadBadFiles(t *testing.T) {
	cases := []struct {
		file string
		kind error
		msg  string
	}{
		{"bad_order.xy", scanfile.ErrNotIncreasing,
			"bad_order.xy:11:1: field 1 (2θ): 2θ = 20.16° does not increase from 20.16° (line 10); 2θ must strictly increase"},
		{"bad_nan.xy", scanfile.ErrNotFinite, `bad_nan.xy:6:7: field 2 (intensity): "NaN" is not a finite number`},
		{"bad_text.xy", scanfile.ErrNotNumber, `bad_text.xy:8:7: field 2 (intensity): "12a4" is not a number`},
		{"bad_negative.xy", scanfile.ErrNegative, "bad_negative.xy:4:7: field 2 (intensity): intensity -5 is negative"},
		{"bad_few.xy", scanfile.ErrTooFewPoints, "bad_few.xy: 12 points; a scan needs at least 20"},
		{"bad_columns.xy", scanfile.ErrColumns, "bad_columns.xy:16: row has 3 fields separated by spaces; earlier rows have 2"},
		{"bad_four.xy", scanfile.ErrColumns,
			"bad_four.xy:2: first data row has 4 fields separated by spaces; want 2 (2θ, intensity) or 3 (2θ, intensity, standard uncertainty)"},
		{"bad_esd.xye", scanfile.ErrNegative, "bad_esd.xye:9:11: field 3 (standard uncertainty): standard uncertainty -3 is negative"},
		{"bad_range.xy", scanfile.ErrOutOfRange, "bad_range.xy:2:1: field 1 (2θ): 2θ = 180° is outside [0°, 180°)"},
		{"bad_missing.cif", scanfile.ErrMissing, `bad_missing.cif:9:7: _pd_meas_counts_total: missing value "?"`},
		{"bad_mixed_esd.cif", scanfile.ErrMissing,
			`bad_mixed_esd.cif:11:7: _pd_meas_counts_total: value "125" has no standard uncertainty in parentheses; 29 other values of the loop have one`},
		{"bad_loop.cif", scanfile.ErrSyntax,
			"bad_loop.cif:3:1: loop_ has 59 values for 2 tags: not a whole number of rows (last row short by 1; check line 35)"},
		{"bad_unclosed.cif", scanfile.ErrSyntax,
			"bad_unclosed.cif:3:1: text field opened with ';' is never closed by a line starting with ';'"},
		{"bad_quote.cif", scanfile.ErrSyntax, "bad_quote.cif:6:7: quoted value not closed on its line (')"},
		{"bad_inf.cif", scanfile.ErrNotFinite, `bad_inf.cif:18:7: _pd_meas_counts_total: "1.5e999" is not a finite number`},
		{"bad_range.cif", scanfile.ErrColumns, "bad_range.cif:5:1: 2θ range 20 to 20.6 by 0.02 gives 31 points but the loop has 30 rows"},
		{"bad_no2theta.cif", scanfile.ErrMissing,
			"bad_no2theta.cif:2:1: loop gives intensities but no 2θ: loop _pd_meas_2theta_scan, _pd_meas_angle_2theta, _pd_proc_2theta_corrected or give _pd_meas_2theta_range_min, _max and _inc"},
		{"bad_nopattern.cif", scanfile.ErrNoData,
			"bad_nopattern.cif: no data block has a looped intensity (_pd_meas_counts_total, _pd_meas_intensity_total, _pd_proc_intensity_total)"},
	}
	for _, c := range cases {
		t.Run(c.file, func(t *testing.T) {
			_, err := readFile(t, c.file)
			var fe *scanfile.Error
			if !errors.As(err, &fe) {
				t.Fatalf("error %v, want *scanfile.Error", err)
			}
			if !errors.Is(err, c.kind) {
				t.Errorf("error kind %v, want %v", fe.Err, c.kind)
			}
			if err.Error() != c.msg {
				t.Errorf("\n got  %s\n want %s", err, c.msg)
			}
		})
	}
}

func TestReadInlineErrors(t *testing.T) {
	cases := []struct {
		name, text string
		kind       error
		msg        string
	}{
		{"nul.xy", "20 1\n21 2\x00\n", scanfile.ErrBinary, "nul.xy:2: NUL byte: a binary file, not a text scan"},
		{"empty.xy", "# only a comment\n\n", scanfile.ErrNoData, "empty.xy: no data rows (lines of 2θ and intensity numbers)"},
		{"hex.xy", "20 1\n0x1p4 3\n", scanfile.ErrNotNumber, `hex.xy:2:1: field 1 (2θ): "0x1p4" is not a number`},
		{"under.xy", "20 1\n1_0 3\n", scanfile.ErrNotNumber, `under.xy:2:1: field 1 (2θ): "1_0" is not a number`},
		{"empty-field.csv", "20,1\n21,\n", scanfile.ErrNotNumber, `empty-field.csv:2:4: field 2 (intensity): "" is not a number`},
		{"late-text.xy", "20 1\nEND\n", scanfile.ErrColumns, "late-text.xy:2: row has 1 fields separated by spaces; earlier rows have 2"},
		{"notcif.cif", "20 1\n", scanfile.ErrSyntax, `notcif.cif:1:1: value "20" has no tag before it`},
		{"dup.cif", "data_a\n_x 1\n_X 2\n", scanfile.ErrSyntax, "dup.cif:3:1: tag _x given twice in data_a (first on line 2)"},
		{"novalue.cif", "data_a\n_x\n_y 2\n", scanfile.ErrSyntax, "novalue.cif:2:1: tag _x has no value"},
		{"nocif.cif", "# nothing\n", scanfile.ErrSyntax, "nocif.cif: no data_ block header: not a CIF file"},
		{"save.cif", "data_a\nsave_frame\n_x 1\n", scanfile.ErrSyntax, "save.cif:4:1: save frame not closed by save_"},
	}
	for _, c := range cases {
		_, err := scanfile.Read(c.name, strings.NewReader(c.text))
		if !errors.Is(err, c.kind) || err.Error() != c.msg {
			t.Errorf("%s:\n got  %v\n want %s (%v)", c.name, err, c.msg, c.kind)
		}
	}
}

// A CIF item may be spread over lines and written in any of the CIF
// string forms; numbers keep their standard uncertainty scaled to the last
// digit (CIF 1.1 syntax: "28.4400(5)" is 28.44 ± 0.0005).
func TestCIFSyntax(t *testing.T) {
	var b strings.Builder
	b.WriteString("# leading comment\r\ndata_x\r\n_pd_spec_id \"ribbon 'A' #2\"\r\n_note\r\n;line one\r\n line two\r\n;\r\nloop_ _pd_meas_angle_2theta _pd_proc_intensity_total\r\n")
	for i := 0; i < 25; i++ {
		fmt.Fprintf(&b, "%d.0000(5) %de2(3) ", 10+i, 10+i)
	}
	b.WriteString("\r\nsave_ignored\r\n_pd_meas_counts_total 1\r\nsave_\r\n")
	s, err := scanfile.Read("x.txt", strings.NewReader(b.String()))
	if err != nil {
		t.Fatal(err)
	}
	if s.Format != scanfile.FormatPowderCIF || s.Len() != 25 {
		t.Fatalf("format %v, %d points", s.Format, s.Len())
	}
	if s.TwoThetaDeg[3] != 13 || s.Counts[3] != 1300 || math.Abs(s.Errors[3]-300) > 1e-9 {
		t.Errorf("row 3 = %v %v(%v), want 13 1300(300)", s.TwoThetaDeg[3], s.Counts[3], s.Errors[3])
	}
	if s.Items["_pd_spec_id"] != "ribbon 'A' #2" || s.Items["_note"] != "line one\n line two" {
		t.Errorf("items %q", s.Items)
	}
}

func TestDetect(t *testing.T) {
	cases := []struct {
		name, text string
		cif        bool
	}{
		{"a.CIF", "", true},
		{"a.txt", "\ufeff# c\n\n  DATA_x\n", true},
		{"a.xy", "20 1\ndata_x\n", false},
		{"a.dat", "", false},
	}
	for _, c := range cases {
		if got := scanfile.IsPowderCIF(c.name, []byte(c.text)); got != c.cif {
			t.Errorf("IsPowderCIF(%q, %q) = %v", c.name, c.text, got)
		}
	}
}

// check verifies the promises Read makes about any scan it returns.
func check(t *testing.T, s scanfile.Scan, err error) {
	t.Helper()
	if err != nil {
		var fe *scanfile.Error
		if !errors.As(err, &fe) {
			t.Fatalf("error %v is not a *scanfile.Error", err)
		}
		if fe.File == "" || fe.Msg == "" || fe.Err == nil {
			t.Fatalf("error lacks file, message or kind: %#v", fe)
		}
		return
	}
	if s.Len() < scanfile.MinPoints || len(s.Counts) != s.Len() || (s.Errors != nil && len(s.Errors) != s.Len()) {
		t.Fatalf("bad lengths %d %d %d", s.Len(), len(s.Counts), len(s.Errors))
	}
	for i, x := range s.TwoThetaDeg {
		if !(x >= 0 && x < 180) || (i > 0 && !(x > s.TwoThetaDeg[i-1])) {
			t.Fatalf("2θ[%d] = %v breaks the contract", i, x)
		}
		if !(s.Counts[i] >= 0) || math.IsInf(s.Counts[i], 0) {
			t.Fatalf("counts[%d] = %v", i, s.Counts[i])
		}
		if s.Errors != nil && (!(s.Errors[i] >= 0) || math.IsInf(s.Errors[i], 0)) {
			t.Fatalf("errors[%d] = %v", i, s.Errors[i])
		}
	}
}

func seeds(f *testing.F, files ...string) {
	for _, name := range files {
		data, err := os.ReadFile(filepath.Join("testdata", name))
		if err != nil {
			f.Fatal(err)
		}
		f.Add(data)
	}
}

func FuzzReadXY(f *testing.F) {
	seeds(f, "good.xy", "good_comma.csv", "good_semicolon.csv", "bad_order.xy", "bad_nan.xy", "bad_columns.xy")
	f.Add([]byte("1 2\r3 4\r"))
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := scanfile.Read("fuzz.xy", bytes.NewReader(data))
		check(t, s, err)
	})
}

func FuzzReadXYE(f *testing.F) {
	seeds(f, "good.xye", "bad_esd.xye", "bad_four.xy")
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := scanfile.Read("fuzz.xye", bytes.NewReader(data))
		check(t, s, err)
	})
}

func FuzzReadCIF(f *testing.F) {
	seeds(f, "good.cif", "good_range.cif", "bad_loop.cif", "bad_unclosed.cif", "bad_quote.cif", "bad_range.cif", "bad_mixed_esd.cif")
	f.Add([]byte("data_a\nsave_b\n_x 1\nsave_\nloop_ _pd_meas_counts_total 1(2) 2e1(3)\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := scanfile.Read("fuzz.cif", bytes.NewReader(data))
		check(t, s, err)
	})
}

func ExampleRead() {
	var b strings.Builder
	b.WriteString("# 2theta  counts\n")
	for i := 0; i < 25; i++ {
		fmt.Fprintf(&b, "%.2f %d\n", 40+0.02*float64(i), 100+i)
	}
	s, err := scanfile.Read("run.xy", strings.NewReader(b.String()))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(s.Format, s.Len(), s.TwoThetaDeg[0], s.Counts[24])

	_, err = scanfile.Read("bad.xy", strings.NewReader("40.00 100\n40.02 -1\n"))
	fmt.Println(err)
	// Output:
	// xy 25 40 124
	// bad.xy:2:7: field 2 (intensity): intensity -1 is negative
}
