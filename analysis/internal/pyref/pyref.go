// Package pyref runs small Python scripts against reference libraries from
// Debian's packages (python3-pymatgen, python3-gemmi, python3-scipy,
// python3-periodictable) so that tests can cross-check meltbook's results
// with code outside the project.
//
// Debian installs these libraries for /usr/bin/python3; another python3
// earlier on PATH may not see them, so the interpreter is searched in a fixed
// order and the first one that imports every required module is used.
//
// When no interpreter has the modules the test is skipped with a message,
// except when the environment variable CI is "true": there a missing
// reference library fails the test, because CI installs them.
package pyref

import (
	"bytes"
	"context"
	"os"
	"os/exec"
	"strings"
	"sync"
	"testing"
	"time"
)

var candidates = []string{"/usr/bin/python3", "python3"}

var (
	mu    sync.Mutex
	found = map[string]string{} // module list -> interpreter ("" = none)
)

// Interpreter returns the path of a Python interpreter that imports all the
// given modules, or "" when none does.
func Interpreter(modules ...string) string {
	key := strings.Join(modules, ",")
	mu.Lock()
	defer mu.Unlock()
	if p, ok := found[key]; ok {
		return p
	}
	script := "import " + strings.Join(modules, ", ")
	for _, c := range candidates {
		path, err := exec.LookPath(c)
		if err != nil {
			continue
		}
		ctx, cancel := context.WithTimeout(context.Background(), 60*time.Second)
		err = exec.CommandContext(ctx, path, "-c", script).Run()
		cancel()
		if err == nil {
			found[key] = path
			return path
		}
	}
	found[key] = ""
	return ""
}

// Require returns an interpreter that imports the modules, or ends the test:
// Skip outside CI, Fatal when CI=true.
func Require(tb testing.TB, modules ...string) string {
	tb.Helper()
	p := Interpreter(modules...)
	if p != "" {
		return p
	}
	msg := "reference library not importable by /usr/bin/python3 or python3 on PATH: " +
		strings.Join(modules, ", ") + " (install Debian's python3-* packages; see DEVELOPERS.md)"
	if os.Getenv("CI") == "true" {
		tb.Fatal(msg)
	}
	tb.Skip(msg)
	return ""
}

// Run runs script with the interpreter that has the modules, feeding stdin,
// and returns its standard output. A failing script fails the test with its
// standard error.
func Run(tb testing.TB, modules []string, script string, stdin []byte) []byte {
	tb.Helper()
	py := Require(tb, modules...)
	ctx, cancel := context.WithTimeout(context.Background(), 5*time.Minute)
	defer cancel()
	cmd := exec.CommandContext(ctx, py, "-c", script)
	cmd.Stdin = bytes.NewReader(stdin)
	var stdout, stderr bytes.Buffer
	cmd.Stdout = &stdout
	cmd.Stderr = &stderr
	if err := cmd.Run(); err != nil {
		tb.Fatalf("reference script failed: %v\n%s", err, stderr.String())
	}
	return stdout.Bytes()
}
