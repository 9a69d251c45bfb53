package exifread

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
)

// goexifDir locates the goexif module (its sample photos are the test
// corpus) through the go command; the test skips when it cannot be found.
func goexifDir(t testing.TB) string {
	t.Helper()
	d := findGoexif()
	if d == "" {
		t.Skip("goexif module directory not found (go list -m github.com/rwcarlsen/goexif)")
	}
	return d
}

// findGoexif asks the go command once per test binary.
var findGoexif = sync.OnceValue(func() string {
	out, err := exec.Command("go", "list", "-m", "-f", "{{.Dir}}", "github.com/rwcarlsen/goexif").Output()
	if err == nil {
		if d := strings.TrimSpace(string(out)); d != "" {
			if _, err := os.Stat(filepath.Join(d, "exif")); err == nil {
				return d
			}
		}
	}
	if out, err := exec.Command("go", "env", "GOMODCACHE").Output(); err == nil {
		m, _ := filepath.Glob(filepath.Join(strings.TrimSpace(string(out)), "github.com", "rwcarlsen", "goexif@*"))
		if len(m) > 0 {
			return m[len(m)-1]
		}
	}
	return ""
})
