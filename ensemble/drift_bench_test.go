package ensemble

import (
	"testing"

	"fifthline/pitchdetect"
	"fifthline/target"
)

// The live drift's cost: four players' frames at the detector's pace
// (a frame every 5 ms each), a just C major chord held; reported per
// second of playing and as a share of one core.
func BenchmarkDriftFramesFourPlayers(b *testing.B) {
	d := NewDrift(target.Default(), target.DefaultSeventh)
	hz := justC(-3)
	const hop = 0.005
	b.ReportAllocs()
	frames := 0
	for b.Loop() {
		tm := float64(frames) * hop
		for i, f := range hz {
			d.Frame(i, pitchdetect.Estimate{Time: tm, Hz: f, Voiced: true})
		}
		if frames%20 == 0 {
			d.Cents() // the meter asks at its redraw pace
		}
		frames++
	}
	perSecond := b.Elapsed().Seconds() / float64(b.N) / hop
	b.ReportMetric(100*perSecond, "%core")
}
