package intake_test

import (
	"strings"
	"testing"

	"meltbook"
	"meltbook/store/intake"
)

func TestReadMapping(t *testing.T) {
	text := "\xef\xbb\xbf# scans of the March library\r\n" +
		"Sample;File name;operator\r\n" +
		"QR-0042.a1;QR-0042.a1_xrd.xy;Ada\r\n" +
		"\r\n" +
		"QR-0043 ; \"run 2; repeat.xy\" ;Ada\r\n" +
		"QR-0044;sub/dir/c.xy;\r\n"
	m, err := intake.ReadMapping("map.csv", strings.NewReader(text))
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct{ path, want string }{
		{"/data/march/QR-0042.a1_xrd.xy", "QR-0042.a1"}, // by base name
		{"run 2; repeat.xy", "QR-0043"},                 // quoted, with the separator inside
		{"sub/dir/c.xy", "QR-0044"},                     // by the path as written
		{"elsewhere/c.xy", "QR-0044"},                   // then by base name: c.xy is not mapped, sub/dir/c.xy is
	}
	for _, c := range cases[:3] {
		if got, ok := m.Sample(c.path); !ok || got != c.want {
			t.Errorf("Sample(%q) = %q, %v; want %q", c.path, got, ok, c.want)
		}
	}
	if _, ok := m.Sample(cases[3].path); ok {
		t.Errorf("elsewhere/c.xy is mapped, though only sub/dir/c.xy is")
	}
	if m.Len() != 3 {
		t.Errorf("%d files mapped; want 3", m.Len())
	}
}

func TestReadMappingRefuses(t *testing.T) {
	cases := []struct{ name, text, where string }{
		{"empty", "# nothing\n\n", "map.csv"},
		{"no sample column", "file,operator\na.xy,Ada\n", "map.csv line 1"},
		{"no sample", "file,sample\na.xy,\n", "map.csv line 2, column 6"},
		{"no file", "file,sample\n,QR-1\n", "map.csv line 2, column 1"},
		{"short row", "file,sample\na.xy\n", "map.csv line 2, column 5"},
		{"twice", "file,sample\na.xy,QR-1\nb.xy,QR-2\na.xy,QR-3\n", "map.csv line 4, column 1"},
		{"open quote", "file,sample\n\"a.xy,QR-1\n", "map.csv line 2, column 1"},
		{"text after quote", "file,sample\n\"a.xy\"x,QR-1\n", "map.csv line 2, column 7"},
		{"not UTF-8", "file,sample\na\xff.xy,QR-1\n", "map.csv line 2"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := intake.ReadMapping("map.csv", strings.NewReader(c.text))
			if meltbook.KindOf(err) != meltbook.Invalid || !strings.HasPrefix(err.Error(), c.where+":") {
				t.Errorf("error %v; want an Invalid error at %q", err, c.where)
			}
		})
	}
}

func TestSampleFromFileName(t *testing.T) {
	cases := []struct {
		path, want string
		ok         bool
	}{
		{"QR-0042.a1_xrd.xy", "QR-0042.a1", true},
		{"/scans/QR-0042.a1 second.xye", "QR-0042.a1", true},
		{"QR-0042.xy", "QR-0042", true},
		{"QR-0042.a1.cif", "QR-0042.a1", true},
		{"QR-0042", "QR-0042", true},
		{"_xrd.xy", "", false},
		{".xy", "", false},
	}
	for _, c := range cases {
		got, ok := intake.SampleFromFileName(c.path)
		if got != c.want || ok != c.ok {
			t.Errorf("SampleFromFileName(%q) = %q, %v; want %q, %v", c.path, got, ok, c.want, c.ok)
		}
	}
}

func FuzzReadMapping(f *testing.F) {
	f.Add("file,sample\na.xy,QR-1\n")
	f.Add("Sample;File\r\nQR-1;\"a;b.xy\"\r\n")
	f.Add("\xef\xbb\xbf# c\nfile\tsample\ta\n\"x\"\"y\",QR\t\n")
	f.Add("file,sample\n\"unclosed,QR-1\n")
	f.Fuzz(func(t *testing.T, text string) {
		m, err := intake.ReadMapping("fuzz.csv", strings.NewReader(text))
		if err != nil {
			if meltbook.KindOf(err) != meltbook.Invalid || !strings.HasPrefix(err.Error(), "fuzz.csv") {
				t.Fatalf("error %v does not name the file or is not Invalid", err)
			}
			return
		}
		if m.Len() < 0 {
			t.Fatal("negative length")
		}
	})
}
