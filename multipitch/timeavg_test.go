package multipitch

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// A voice loudest at the low end of its vibrato (a bowed string whose
// fundamental swells as the pitch dips) is read at the vibrato's time
// average, its centre by construction, not at the loudness-weighted pitch
// a long window's one fit gives. D5 (587.33 Hz, equal temperament at
// A4 = 440 Hz, ISO 16), ±15 ¢ at 5.5 Hz: a violinist's vibrato (common
// practice), its level swinging ±60 % in step with the pitch's dip.
func TestVibratoReadAtItsTimeAverage(t *testing.T) {
	const d5, width, vibHz = 587.33, 30.0, 5.5 // width peak to peak
	x := chord(4, 0, 1, part{testsignal.Saw, testsignal.Vibrato(d5, width, vibHz), d5})
	for i := range x {
		x[i] *= 1 - 0.6*math.Sin(2*math.Pi*vibHz*float64(i)/rate)
	}
	mean := func(avg bool) float64 {
		e, err := New(rate, 0, 0, Config{})
		if err != nil {
			t.Fatal(err)
		}
		if !avg {
			e.avg = nil
		}
		sum, n := 0.0, 0
		e.Feed(testsignal.Float32(x), func(f Frame) {
			if f.Time < 0.5 || f.Time > 3.5 || len(f.Voices) != 1 {
				return
			}
			sum += testsignal.Cents(f.Voices[0].Hz, d5)
			n++
		})
		if n < 20 {
			t.Fatalf("%d frames with one voice", n)
		}
		return sum / float64(n)
	}
	long, got := mean(false), mean(true)
	t.Logf("mean over frames: %+.3f ¢ (long window alone %+.3f ¢)", got, long)
	if math.Abs(got) > 1 || math.Abs(got) > math.Abs(long)/2 {
		t.Errorf("read %+.3f ¢ from the vibrato's centre; want within 1 ¢ and half the long window's %+.3f ¢", got, long)
	}
}
