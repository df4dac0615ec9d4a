package multipitch

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// A four-voice chord entering after half a second of silence is read
// whole, every voice within 2 ¢, by a frame whose window ends no later than
// 300 ms after the chord began (the figure; counted in samples, not
// clock time). That frame reads the half window; the frames after it, once
// a whole window holds the chord, read whole windows, and time only moves
// forward.
func TestFirstChordReadingAfterSilence(t *testing.T) {
	truth := []float64{et(-14), b3, d4, f4} // G3 B3 D4 F4, ISO 16 equal temperament
	x := chord(2, 40, 3, steady(testsignal.WeakFund, truth[0]), steady(testsignal.OddOnly, truth[1]),
		steady(testsignal.Saw, truth[2]), steady(testsignal.StrongSecond, truth[3]))
	const lead = 0.5
	in := append(make([]float32, int(lead*rate)), testsignal.Float32(x)...)
	e, err := New(rate, 0, 0, Config{})
	if err != nil {
		t.Fatal(err)
	}
	whole := float64(e.Window()) / rate
	first, last := math.NaN(), math.Inf(-1)
	span, wholes := 0.0, 0
	e.Feed(in, func(f Frame) {
		if f.Time <= last {
			t.Errorf("frame at %.3f s after one at %.3f s", f.Time, last)
		}
		last = f.Time
		if f.Span == whole {
			wholes++
		}
		if !math.IsNaN(first) || len(f.Voices) != len(truth) {
			return
		}
		for i, v := range f.Voices {
			if math.Abs(testsignal.Cents(v.Hz, truth[i])) > 2 {
				return
			}
		}
		first = f.Time + f.Span/2 - lead
		span = f.Span
	})
	if !(first <= 0.3) {
		t.Fatalf("first whole reading %.3f s after the chord began, want ≤ 0.3", first)
	}
	if span != whole/2 || wholes == 0 {
		t.Errorf("first reading on %.3f s, want the half window %.3f s; %d whole windows after", span, whole/2, wholes)
	}
	t.Logf("first reading %.0f ms after the onset", 1000*first)
}
