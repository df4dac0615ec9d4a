package report

import (
	"io"
	"testing"

	"fifthline/journal"
)

func longRehearsal() []journal.Entry {
	notes := []string{"Bb3", "F4", "C4", "G4", "D4", "A4", "E4", "B4", "F#4", "C#5"}
	var es []journal.Entry
	for i := range 10000 {
		es = append(es, entry("Ann", notes[i%len(notes)], float64(i)/60, float64(i%11-5), 40, "Gb4"))
	}
	return es
}

func BenchmarkSummarize10kNotes(b *testing.B) {
	es := longRehearsal()
	for b.Loop() {
		Summarize(es, Options{Tolerance: 5})
	}
}

func BenchmarkPlotPNG10kNotes(b *testing.B) {
	es := longRehearsal()
	groups := Summarize(es, Options{Tolerance: 5})
	for b.Loop() {
		if err := Plot(io.Discard, "png", es, groups, Options{Tolerance: 5}); err != nil {
			b.Fatal(err)
		}
	}
}
