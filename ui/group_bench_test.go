package ui

import (
	"testing"

	"fifthline/target"
)

// The group meter's own share of a second of four players: 188 frames
// (the detector's hop at 48 kHz) and 15 screens at 80 × 24.
//
//	go test -run XXX -bench GroupMeterSecond ./ui/
func BenchmarkGroupMeterSecond(b *testing.B) {
	tu := target.Default()
	g := newGroupModel(newModel(tu, "bench"), []string{"vc", "vla", "vl2", "vl1"}, 0)
	hz := []float64{d3, a3, etFSharp4, et(5)}
	levels := []float64{-20, -20, -20, -20}
	now := 0.0
	for b.Loop() {
		for i := range 188 {
			now += 1.0 / 188
			g.AddFrame(GroupFrame{Time: now, Hz: hz, Levels: levels})
			if i%12 == 0 {
				groupLayout(g, 80, 24)
			}
		}
	}
}
