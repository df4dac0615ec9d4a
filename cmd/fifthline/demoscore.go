package main

import (
	"fifthline/target"
)

// The embedded demo: a tenor line in G minor played by a resynthesised reed
// voice in ¼-comma meantone at A4 = 415 Hz, the way a consort at low pitch
// would tune with a meantone organ. The player is mostly good, but sits on
// the wrong spelling twice — a leading-tone F♯ pushed up onto G♭, an E♭ let
// down onto D♯ — and drifts a few cents on two notes, so a newcomer sees every
// part of the meter at work; the closing C♯, the key's raised fourth leading
// to the dominant, is spelled from G minor's window (A♭ … C♯). The phrase and
// its flaws are our own invention.
var demoScore = struct {
	key, temperament, a4 string
	bpm                  float64
	notes                []scoreNote
}{
	key: "G minor", temperament: "meantone:1/4", a4: "415", bpm: 66,
	notes: []scoreNote{
		{"D4", 2, 0, false},
		{"G4", 1, 0, false},
		{"A4", 1, -7, false}, // a little flat
		{"Bb4", 3, 0, true},
		{"A4", 1, 0, false},
		{"G4", 1, 0, false},
		{"F#4", 1, +41.059, false}, // pushed up onto Gb4 (the lesser diesis)
		{"G4", 3, 0, true},
		{"", 1, 0, false},
		{"Eb4", 2, -41.059, false}, // let down onto D#4
		{"D4", 1, 0, false},
		{"C4", 1, +5, false}, // a little sharp
		{"Bb3", 1, 0, false},
		{"A3", 1, 0, false},
		{"Bb3", 1, 0, false},
		{"C4", 1, 0, false},
		{"C#4", 1, 0, false},
		{"D4", 4, 0, true},
		{"", 2, 0, false},
	},
}

// scoreNote is one note of the demo: a spelled note ("" for a rest), its
// length in beats, how far from the note's target the player puts it, and
// whether it is played with vibrato.
type scoreNote struct {
	note    string
	beats   float64
	cents   float64
	vibrato bool
}

// demoTuning is the tuning the demo score is written for.
func demoTuning() (target.Tuning, error) {
	mf := &musicalFlags{key: demoScore.key, temperament: demoScore.temperament, a4: demoScore.a4, anchor: "a4"}
	return mf.tuning()
}
