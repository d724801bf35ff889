package intake_test

import (
	"fmt"
	"strings"

	"meltbook/store/intake"
)

// The sample a scan belongs to, from its file name.
func ExampleSampleFromFileName() {
	for _, name := range []string{"QR-0042.a1_xrd.xy", "scans/QR-0042 repeat.xye", "QR-0043.cif"} {
		code, _ := intake.SampleFromFileName(name)
		fmt.Println(code)
	}
	// Output:
	// QR-0042.a1
	// QR-0042
	// QR-0043
}

// A mapping of scan files to samples, as a spreadsheet saves it.
func ExampleReadMapping() {
	m, err := intake.ReadMapping("map.csv", strings.NewReader("Sample;File;Notes\nQR-0042.a1;run 1.xy;thin end\nQR-0043;run 2.xy;\n"))
	if err != nil {
		fmt.Println(err)
		return
	}
	s, ok := m.Sample("/data/march/run 2.xy")
	fmt.Println(m.Len(), s, ok)
	// Output:
	// 2 QR-0043 true
}
