package sheet

import (
	"fmt"
	"strings"
	"testing"
)

func BenchmarkParse1000Rows(b *testing.B) {
	var sb strings.Builder
	sb.WriteString(header)
	for i := 0; i < 1000; i++ {
		fmt.Fprintf(&sb, "d/IMG_%04d.jpg,pole,2.0,3.5,%d,,,,,,,\"note, %d\"\n", i, i%360, i)
	}
	src := sb.String()
	b.SetBytes(int64(len(src)))
	for b.Loop() {
		if _, err := Parse(strings.NewReader(src), "b.csv"); err != nil {
			b.Fatal(err)
		}
	}
}
