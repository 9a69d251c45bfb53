package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"

	"github.com/gnomon-forensics/gnomon/internal/testkit/smallset"
	"github.com/gnomon-forensics/gnomon/report"
)

// unprivilegedUID is the conventional "nobody" user and group on Debian
// and most Linux systems (common practice).
const unprivilegedUID = 65534

// TestAuditPermissionDenied: a file and a folder the examiner's account
// may not read each get a report row saying so (verdict unreadable, the
// reason naming the permission), the rest of the batch is audited, and the
// counts add up. Root reads through permission bits, so when the tests run
// as root (as in CI) the audit runs as the unprivileged user instead; a
// non-root run is covered by TestHostileCorpus's permission item too.
func TestAuditPermissionDenied(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	asRoot := os.Geteuid() == 0
	tmp := t.TempDir()
	if asRoot {
		// The unprivileged user must reach the binary, the evidence and
		// the report folder.
		for _, d := range []string{filepath.Dir(tmp), tmp} {
			if err := os.Chmod(d, 0o777); err != nil {
				t.Fatal(err)
			}
		}
		for d := filepath.Dir(filepath.Dir(tmp)); ; d = filepath.Dir(d) {
			if st, err := os.Stat(d); err != nil || st.Mode().Perm()&0o001 == 0 {
				t.Skipf("%s is closed to other users (TMPDIR=%q), so the unprivileged audit cannot reach its files", d, os.Getenv("TMPDIR"))
			}
			if d == filepath.Dir(d) {
				break
			}
		}
	}
	bin := buildGnomon(t, tmp)
	evidence := filepath.Join(tmp, "evidence")
	if _, err := smallset.Write(evidence, 3, smallset.Options{}); err != nil {
		t.Fatal(err)
	}
	denied := filepath.Join(evidence, "denied.jpg")
	locked := filepath.Join(evidence, "locked")
	if err := os.WriteFile(denied, []byte("\xff\xd8\xff\xd9"), 0o000); err != nil {
		t.Fatal(err)
	}
	if err := os.Mkdir(locked, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(locked, "hidden.jpg"), []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Chmod(locked, 0o000); err != nil {
		t.Fatal(err)
	}
	defer os.Chmod(locked, 0o755) // so that the temporary folder can be removed
	out := filepath.Join(tmp, "report")

	cmd := exec.Command(bin, "audit", evidence, "--out", out, "--quiet", "--formats", "json")
	if asRoot {
		cmd.SysProcAttr = &syscall.SysProcAttr{Credential: &syscall.Credential{Uid: unprivilegedUID, Gid: unprivilegedUID}}
	}
	if b, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("audit: %v\n%s", err, b)
	}
	f, err := os.Open(filepath.Join(out, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	a, err := report.ReadJSON(f)
	if err != nil {
		t.Fatal(err)
	}
	rows := map[string]report.Photo{}
	for _, p := range a.Photos {
		rows[p.Path] = p
	}
	for _, name := range []string{"denied.jpg", "locked"} {
		p, ok := rows[name]
		switch {
		case !ok:
			t.Errorf("%s: no report row (rows: %d)", name, len(a.Photos))
		case p.Verdict != "unreadable" || !strings.Contains(p.Error, "permission denied"):
			t.Errorf("%s: verdict %q, error %q; want unreadable, naming the permission", name, p.Verdict, p.Error)
		}
	}
	read := 0
	for _, p := range a.Photos {
		if p.Path != "denied.jpg" && p.Path != "locked" {
			if p.SHA256 == "" || p.Verdict == "unreadable" {
				t.Errorf("%s: not audited (verdict %q, error %q)", p.Path, p.Verdict, p.Error)
			}
			read++
		}
	}
	if read != 3 {
		t.Errorf("%d of the 3 readable photos have a row", read)
	}
	if a.Run.Counts.Files != len(a.Photos) || a.Run.Counts.Files != 5 {
		t.Errorf("counts: files %d, rows %d, want 5 (3 photos, the file, the folder)", a.Run.Counts.Files, len(a.Photos))
	}
}
