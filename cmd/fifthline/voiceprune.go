package main

import (
	"math"
	"slices"

	"fifthline/multipitch"

	"fifthline/target"
)

// keyCents is how far from every target of the key's spelling window a
// candidate fundamental may lie and still be tried as a voice: a player
// 40 ¢ off is read, what sits between the window's notes (a quarter tone
// from all of them in equal temperament, up to 58 ¢ in the wide gaps of
// quarter-comma meantone) is no voice of the key. The estimator's
// candidate grid is 10 ¢, so the bar is a grid step's half above 40.
const keyCents = 45.0

// inKey is the estimator's candidate pruning for a tuning: fundamentals
// within keyCents of a target of the key's spelling window. It prunes, it
// does not correct: a voice kept is measured where it is.
func inKey(tuning func() target.Tuning) func(hz float64) bool {
	return func(hz float64) bool { return math.Abs(tuning().Classify(hz).Deviation) <= keyCents }
}

// reported prunes a frame's voices in place to those in the key's window
// and, when a chord is declared (--chord), of its pitch classes. A voice
// outside them is still fitted with the others, so that its partials are
// not taken for voices of the chord (an A4 over a declared C major's C4 E4
// G4 would otherwise leave E5 and E6 from its 3rd and 6th partials); it is
// only not reported.
func reported(tuning func() target.Tuning) func(vs []multipitch.Voice) []multipitch.Voice {
	var members [12]bool
	var of *target.Chord // the chord members holds
	return func(vs []multipitch.Voice) []multipitch.Voice {
		tu := tuning() // the meter's keys may change it between frames
		if tu.Chord != of {
			of, members = tu.Chord, [12]bool{}
			if tu.Chord != nil {
				for _, m := range tu.Chord.Members() {
					members[m.Note.PitchClass()] = true
				}
			}
		}
		return slices.DeleteFunc(vs, func(v multipitch.Voice) bool {
			r := tu.Classify(v.Hz)
			return math.Abs(r.Deviation) > keyCents || (tu.Chord != nil && !members[r.Note.PitchClass()])
		})
	}
}
