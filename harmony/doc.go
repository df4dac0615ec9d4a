// Package harmony finds the chords that held notes make together and reads
// each member within each chord. It serves both ways of hearing a group:
// one player per channel (package ensemble) and several voices on one
// channel (multipitch, followed in cmd/fifthline), so that a chord is one
// thing whichever way it was heard: one minimum length, one rule for
// joining stretches, one rule for leaving out a chord's edges. One thing
// differs: voices on one channel may hold a note that is a lower one's
// partial, so FindOneChannel names a chord without it where the notes with
// it name none (partials.go).
//
// It lives in neither of those packages because it needs neither: only
// held notes with their spelled names, their frames, and target to name
// the chord. It is pure: no files, devices or clocks.
package harmony
