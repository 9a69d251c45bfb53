package report

import (
	"errors"
	"io"
	"os"
	"path/filepath"
	"testing"
)

func TestWriteFileAtomic(t *testing.T) {
	boom := errors.New("boom")
	tests := []struct {
		name    string
		old     string // existing content, "" for none
		write   func(io.Writer) error
		want    string // content afterwards
		wantErr error
	}{
		{"new file", "", func(w io.Writer) error { _, err := io.WriteString(w, "hello\n"); return err }, "hello\n", nil},
		{"replace", "old", func(w io.Writer) error { _, err := io.WriteString(w, "new"); return err }, "new", nil},
		{"failed write keeps old", "old", func(w io.Writer) error { io.WriteString(w, "partial"); return boom }, "old", boom},
		{"failed write creates nothing", "", func(w io.Writer) error { return boom }, "", boom},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			p := filepath.Join(dir, "report.json")
			if tc.old != "" {
				if err := os.WriteFile(p, []byte(tc.old), 0o644); err != nil {
					t.Fatal(err)
				}
			}
			err := WriteFileAtomic(p, tc.write)
			if !errors.Is(err, tc.wantErr) {
				t.Fatalf("err = %v, want %v", err, tc.wantErr)
			}
			got, rerr := os.ReadFile(p)
			if tc.want == "" {
				if !os.IsNotExist(rerr) {
					t.Errorf("file exists after failure")
				}
			} else if string(got) != tc.want {
				t.Errorf("content %q, want %q", got, tc.want)
			}
			entries, _ := os.ReadDir(dir)
			for _, e := range entries {
				if e.Name() != "report.json" {
					t.Errorf("left behind %q", e.Name())
				}
			}
		})
	}
}

func TestWriteFileAtomicBadDir(t *testing.T) {
	err := WriteFileAtomic(filepath.Join(t.TempDir(), "missing", "x.csv"), func(io.Writer) error { return nil })
	if !errors.Is(err, os.ErrNotExist) {
		t.Fatalf("err = %v, want a wrapped ErrNotExist", err)
	}
}
