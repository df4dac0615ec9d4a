package main

import (
	"fifthline/capture"
	"fifthline/ensemble"
	"fifthline/target"
)

// demo --group: a consort of four, bass, tenor, alto and treble, each on a
// channel of their own, in the single demo's tuning (G minor, ¼-comma
// meantone at A4 = 415 Hz), reading a short chorale of our own: G minor,
// C minor, D major, D dominant seventh, G minor, E♭ major, C minor, D major
// and a closing G major with its raised third. Common tones are held across
// the changes. Each player has a habit the meter should show: the bass
// plays on the targets, the tenor sits 3 ¢ flat, the alto 2 ¢ sharp, and
// the treble pushes her A4 6 ¢ sharp and plays her long notes with vibrato.
// Every microphone also hears the other three 20 dB down and 2 ms late, as
// close microphones do, so the ensemble reading removes real bleed.

// consortBPM is the chorale's pace: a chord every 2.4 s, long enough to
// read.
const consortBPM = 50

// consortParts are the four parts, bass first: note, beats, cents from
// the target, vibrato.
var consortParts = [][]scoreNote{
	{ // bass
		{"G2", 2, 0, false}, {"C3", 2, 0, false}, {"D3", 4, 0, false}, {"G2", 2, 0, false},
		{"Eb3", 2, 0, false}, {"C3", 2, 0, false}, {"D3", 2, 0, false}, {"G2", 4, 0, false}, {"", 2, 0, false},
	},
	{ // tenor, 3 ¢ flat throughout
		{"D3", 2, -3, false}, {"Eb3", 2, -3, false}, {"F#3", 4, -3, false}, {"G3", 6, -3, false},
		{"F#3", 2, -3, false}, {"D3", 4, -3, false}, {"", 2, 0, false},
	},
	{ // alto, 2 ¢ sharp throughout
		{"Bb3", 2, 2, false}, {"C4", 2, 2, false}, {"D4", 2, 2, false}, {"C4", 2, 2, false},
		{"Bb3", 4, 2, false}, {"C4", 2, 2, false}, {"A3", 2, 2, false}, {"B3", 4, 2, false}, {"", 2, 0, false},
	},
	{ // treble: A4 6 ¢ sharp, vibrato on the long notes
		{"G4", 4, 0, true}, {"A4", 4, 6, true}, {"G4", 4, 0, true}, {"Eb4", 2, 0, false},
		{"D4", 2, 0, false}, {"G4", 4, 0, true}, {"", 2, 0, false},
	},
}

// consortPlayers are the consort's players, one a channel, their chords'
// sevenths read against seventh (--seventh).
func consortPlayers(seventh float64) playerOptions {
	names := []string{"bass", "tenor", "alto", "treble"}
	po := playerOptions{seventh: seventh}
	for i, n := range names {
		po.players = append(po.players, ensemble.Player{Name: n, Channel: i})
	}
	return po
}

// Bleed between the consort's microphones: 20 dB down (×0.1), 2 ms late.
const (
	consortBleed = 0.1
	consortDelay = demoRate * 2 / 1000
)

// consort is the four parts as one four-channel source, paced by the wall
// clock like an interface: the bass's performance keeps the time and the
// others follow it sample for sample.
type consort struct {
	parts     []*capture.Performance
	own, past [][]float32 // this block of each part; its last consortDelay samples before it
}

func newConsort(tu target.Tuning) *consort {
	c := &consort{}
	for i, part := range consortParts {
		c.parts = append(c.parts, capture.NewPerformance(demoRate, scoreTones(part, consortBPM, tu), i == 0))
		c.own = append(c.own, nil)
		c.past = append(c.past, make([]float32, consortDelay))
	}
	return c
}

func (c *consort) SampleRate() float64 { return demoRate }
func (c *consort) Channels() int       { return len(c.parts) }

// ReadChannels gives each microphone its player and the others' bleed.
func (c *consort) ReadChannels(dst [][]float32) (int, error) {
	want := len(dst[0])
	for i := range c.own {
		if cap(c.own[i]) < want {
			c.own[i] = make([]float32, want)
		}
		c.own[i] = c.own[i][:want]
	}
	n, err := c.parts[0].Read(c.own[0])
	for i := 1; i < len(c.parts); i++ {
		m, _ := c.parts[i].Read(c.own[i][:n]) // the parts are equally long
		clear(c.own[i][m:n])
	}
	for ch := range dst {
		for s := range n {
			v := c.own[ch][s]
			for o := range c.own {
				if o != ch {
					v += consortBleed * c.delayed(o, s)
				}
			}
			dst[ch][s] = v
		}
	}
	for o := range c.own {
		c.past[o] = append(c.past[o], c.own[o][:n]...)[n:]
	}
	return n, err
}

// delayed is part o's sample consortDelay before sample s of this block.
func (c *consort) delayed(o, s int) float32 {
	if s >= consortDelay {
		return c.own[o][s-consortDelay]
	}
	return c.past[o][len(c.past[o])-consortDelay+s]
}
