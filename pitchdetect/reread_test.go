package pitchdetect

import (
	"math"
	"math/rand/v2"
	"testing"

	"fifthline/internal/testsignal"
)

// A frame under a slur, read again as the note slurred to. The signal:
// A4 (440 Hz, sawtooth partials) fading out over 0.1 s, and from its
// fade's start C♯5 a pure major third above it (440·5/4 = 550 Hz; common
// practice) entering 12 dB quieter. In the frames whose window holds
// both, C♯5's partials that are not on A4's comb (its 4th, 2200 Hz, is
// A4's 5th) read 550 Hz within 1 ¢: the tone is synthesised at that
// frequency. A frame the detector no longer keeps reads nothing.
func TestRereadHearsTheNoteSlurredToUnderTheLastOnesTail(t *testing.T) {
	const rate = 48000.0
	n := int(1.0 * rate) // longer than the frames the detector keeps
	a4 := testsignal.Tone(rate, n, testsignal.Saw, 0.5, testsignal.Steady(440))
	cs5 := testsignal.Tone(rate, n, testsignal.Saw, 0.5/4, testsignal.Steady(550))
	x := make([]float64, n)
	fade, enter := int(0.3*rate), int(0.3*rate)
	for i := range x {
		g := 1.0
		if i >= fade {
			g = math.Max(0, 1-float64(i-fade)/(0.1*rate))
		}
		x[i] = g * a4[i]
		if i >= enter {
			x[i] += cs5[i]
		}
	}
	d, err := New(rate, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	est := d.Feed(testsignal.Float32(x), nil)
	read := 0
	for _, e := range est {
		// The window (about ±48 ms) holds both notes.
		if e.Time < 0.31 || e.Time > 0.39 {
			continue
		}
		hz, pw, ok := d.Reread(e.Time, 550, 440, 0)
		if !ok {
			t.Errorf("frame at %.3f s (detector: %.2f Hz, voiced %v): no reading of C♯5", e.Time, e.Hz, e.Voiced)
			continue
		}
		read++
		if c := testsignal.Cents(hz, 550); math.Abs(c) > 1 {
			t.Errorf("frame at %.3f s reads C♯5 %.3f Hz, %+.2f ¢", e.Time, hz, c)
		}
		if pw <= 0 {
			t.Errorf("frame at %.3f s: C♯5's power %g", e.Time, pw)
		}
	}
	if read == 0 {
		t.Fatal("no frame under the slur")
	}
	if _, _, ok := d.Reread(0.05, 440, 0, 0); ok {
		t.Error("a frame older than the detector keeps was read")
	}
}

// A quick note slurred between two others reads midway (in cents) between
// its middle, as summarise reads it, and the median of its frames over the
// span it sounds read again through both slurs (throughSlurs). The frames
// are a track of our own: G4, a quick A4 voiced for ten frames at 440 Hz
// between slurs three frames long, then B4; the reader (standing in for
// the detector's spectra) hears each note from the middle of the slur
// into it to the middle of the slur out of it, A4 at 438 Hz for its first
// five frames (its attack, mostly under the slur) and 441 Hz after: the
// span's median is 441 Hz, and A4 reads the geometric mean of 440 and 441.
// Without Reread (a reader that keeps no spectra) it reads its middle
// alone, and the notes not slurred between two read alike either way.
func TestQuickSlurredNoteReadsMidwayThroughItsSlurs(t *testing.T) {
	hop := 512.0 / 48000
	var track []float64
	for range 20 {
		track = append(track, 392) // G4
	}
	track = append(track, 0, 0, 0)
	for range 10 {
		track = append(track, 440) // A4, its middle
	}
	track = append(track, 0, 0, 0)
	for range 20 {
		track = append(track, 493.9) // B4
	}
	firstA4 := 23 * hop
	reread := func(at, hz, under, over float64) (float64, float64, bool) {
		sounds := 440.0 // A4 from halfway through the slur into it ...
		switch {
		case at < 21*hop:
			sounds = 392
		case at >= 34.5*hop: // ... to halfway through the slur out of it
			sounds = 493.9
		}
		if math.Abs(testsignal.Cents(hz, sounds)) > 50 {
			return 0, 0, false
		}
		if sounds == 440 && at < firstA4+2*hop-hop/4 {
			return 438, 1, true
		}
		if sounds == 440 {
			return 441, 1, true
		}
		return sounds, 1, true
	}
	push := func(with bool) []Held {
		s := NewSegmenter(hop)
		s.Window = 4608.0 / 48000
		if with {
			s.Reread = reread
		}
		var notes []Held
		for i, hz := range track {
			if h, ok := s.Push(Estimate{Time: float64(i) * hop, Hz: hz, Voiced: hz > 0, Level: -30}); ok {
				notes = append(notes, h)
			}
		}
		if h, ok := s.Flush(); ok {
			notes = append(notes, h)
		}
		return notes
	}
	plain, through := push(false), push(true)
	if len(plain) != 3 || len(through) != 3 {
		t.Fatalf("notes %d and %d, want G4 A4 B4 both ways", len(plain), len(through))
	}
	if c := testsignal.Cents(plain[1].Hz, 440); math.Abs(c) > 0.01 {
		t.Errorf("without Reread A4 reads %.3f Hz, want its middle, 440", plain[1].Hz)
	}
	want := math.Sqrt(440 * 441)
	if c := testsignal.Cents(through[1].Hz, want); math.Abs(c) > 0.01 {
		t.Errorf("through its slurs A4 reads %.3f Hz, want midway between 440 and 441 (%.3f)", through[1].Hz, want)
	}
	for _, i := range []int{0, 2} {
		if through[i].Hz != plain[i].Hz {
			t.Errorf("note %d (not slurred between two) reads %.3f Hz through slurs, %.3f without", i, through[i].Hz, plain[i].Hz)
		}
	}
}

// An unvoiced frame's spectra are taken only while it may be read again
// (mayReread): every frame the segmenter reads again lies within
// 2·turningSeconds (and a hop) after a voiced frame. The signal, our own:
// two legato phrases of sawtooths, G4 held, A4 and B4 quick (0.12 s,
// slurred between two others), C5 held (equal temperament, A4 = 440 Hz;
// common practice), with noise 40 dB under them between the phrases.
func TestFramesReadAgainLieNearAVoicedFrame(t *testing.T) {
	const rate = 48000.0
	et := func(semis float64) float64 { return 440 * math.Exp2(semis/12) }
	var x []float64
	phrase := func() {
		for _, n := range []struct{ hz, s float64 }{{et(-2), 0.4}, {et(0), 0.12}, {et(2), 0.12}, {et(3), 0.4}} {
			x = append(x, testsignal.Tone(rate, int(n.s*rate), testsignal.Saw, 0.5, testsignal.Steady(n.hz))...)
		}
	}
	phrase()
	noise := testsignal.White(rand.New(rand.NewPCG(3, 4)), int(1.2*rate))
	for i := range noise {
		noise[i] *= 0.005
	}
	x = append(x, noise...)
	phrase()
	x = append(x, noise...)

	d, err := New(rate, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	seg := d.NewSegmenter()
	var voiced []float64
	asked := 0
	seg.Reread = func(at, hz, under, over float64) (float64, float64, bool) {
		asked++
		last := math.Inf(-1)
		for _, v := range voiced {
			if v < at {
				last = v
			}
		}
		if bound := 2*turningSeconds + float64(d.Hop())/rate; at-last >= bound {
			t.Errorf("frame at %.3f s read again %.3f s after the last voiced frame (bound %.3f s)", at, at-last, bound)
		}
		return d.Reread(at, hz, under, over)
	}
	for _, e := range d.Feed(testsignal.Float32(x), nil) {
		if e.Voiced {
			voiced = append(voiced, e.Time)
		}
		seg.Push(e)
	}
	seg.Flush()
	if asked == 0 {
		t.Fatal("no frame was read again: the signal holds no quick slurred note")
	}
}
