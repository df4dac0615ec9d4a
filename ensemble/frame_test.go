package ensemble

import (
	"testing"

	"fifthline/internal/testsignal"
)

// When a frame is evidence of what channel c hears of player d. Player d
// sings A4 (440 Hz, ISO 16); channel c hears her 25 dB down and may hold
// a soft F2 of its own tuned just below her (88 Hz: its fifth harmonic on
// her A4, 5/1, common practice), or a third player's E4 (330 Hz, its
// fourth harmonic on her 3rd partial, 1320 Hz). One analysis window
// (4096 samples at 48 kHz); levels in dBFS as the detector gives them.
func TestBleedEvidenceOnlyWhereTheChannelsOwnSoundIsKnown(t *testing.T) {
	const n = 4096
	a4 := testsignal.Tone(rate, n, testsignal.Saw, 0.3, testsignal.Steady(440))
	f2 := testsignal.Tone(rate, n, testsignal.Saw, 0.05, testsignal.Steady(88))
	e4 := testsignal.Tone(rate, n, testsignal.Saw, 0.3, testsignal.Steady(330))
	mix := func(own []float64) []float64 {
		x := make([]float64, n)
		for i := range x {
			x[i] = 0.056 * a4[i] // −25 dB
			if own != nil {
				x[i] += own[i]
			}
		}
		return x
	}
	for _, c := range []struct {
		name     string
		own      []float64 // what channel 0 holds of its own
		read, hz float64   // channel 0's pitch before and after the ownership test
		level    float64
		evidence bool
	}{
		{"silent", nil, 0, 0, -60, true},
		// Unread and within quietDB of her: a sound of its own.
		{"own soft note, unread", f2, 0, 0, -30, false},
		{"own soft note, read and given away", f2, 88, 0, -30, false},
		{"own soft note, read", f2, 88, 88, -30, false},
		{"silent, her bleed read and given away", nil, 440, 0, -45, true},
	} {
		o := NewOwner(rate, n, 3)
		o.Set(0, mix(c.own), nil)
		o.Set(1, a4, nil)
		o.Set(2, e4, nil)
		m := newBleedModel(n, 3)
		f := newFrameReadings(3)
		f.read[0], f.hz[0], f.level[0] = c.read, c.hz, c.level
		f.read[1], f.hz[1], f.level[1] = 440, 440, -20
		f.steady[0], f.steady[1] = true, true
		m.observe(o, f)
		if got := m.pair(0, 1).frames > 0; got != c.evidence {
			t.Errorf("%s: evidence taken %v, want %v", c.name, got, c.evidence)
		}
	}
	// A third player's partials are left out, hers elsewhere kept.
	o := NewOwner(rate, n, 3)
	o.Set(0, mix(nil), nil)
	o.Set(1, a4, nil)
	o.Set(2, e4, nil)
	m := newBleedModel(n, 3)
	f := newFrameReadings(3)
	f.level[0] = -60
	f.read[1], f.hz[1], f.level[1] = 440, 440, -20
	f.read[2], f.hz[2], f.level[2] = 330, 330, -20
	f.steady[0], f.steady[1], f.steady[2] = true, true, true
	m.observe(o, f)
	binHz := rate / n
	p := m.pair(0, 1)
	if at := p.a[int(1320/binHz+0.5)]; at != 0 {
		t.Errorf("evidence taken at 1320 Hz, the third player's fourth partial: %v", at)
	}
	if at := p.a[int(880/binHz+0.5)]; at == 0 {
		t.Error("no evidence at 880 Hz, clear of the third player")
	}
}
