package journal

import (
	"strings"
	"testing"
)

// A long rehearsal: ten thousand held notes (about three hours of playing).
func BenchmarkRead10kNotes(b *testing.B) {
	body := headerLine() + strings.Repeat(sampleLine+"\n", 10000)
	b.SetBytes(int64(len(body)))
	for b.Loop() {
		if es, _, err := Read(strings.NewReader(body), "bench"); err != nil || len(es) != 10000 {
			b.Fatal(len(es), err)
		}
	}
}
