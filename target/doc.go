// Package target knows where every spelled note should sound.
//
// Given a key, a temperament and a reference pitch it computes the target
// frequency of each spelled note — F♯4 and G♭4 separately, since in most
// temperaments other than equal they are different pitches — and reads a
// measured frequency as the spelled note a player in that key means, with the
// other spelling and its distance beside it (Tuning.Classify → Reading).
//
// It is pure: no audio, no files, no clocks. Measuring a frequency is the job
// of package pitchdetect; reading temperament files from disk and printing is
// left to the command. Pitches are handled in cents (1200 per octave) relative
// to C4, and converted to hertz only at the edges.
package target
