package mts

import "math"

// Word is a frequency in the standard's three-byte form, counted in steps of
// 1/16384 of an equal-tempered semitone above MIDI key 0 of equal temperament
// at A4 = 440 Hz (8.1758 Hz): the top 7 bits are the semitone (the key at or
// below the frequency), the low 14 bits the fraction above it. One step is
// 100/16384 ≈ 0.0061 ¢.
type Word uint32

// Steps is how many steps the standard divides a semitone into.
const Steps = 1 << 14

// MaxWord is the highest frequency the standard can name, 7F 7F 7E
// (13289.73 Hz): 7F 7F 7F is reserved for "no change".
const MaxWord Word = 127<<14 | 0x3FFE

// noChange is the reserved word 7F 7F 7F.
const noChange Word = 127<<14 | 0x3FFF

// keyA4 is A4's MIDI key, which sits at 440 Hz in the standard's frame.
const keyA4 = 69

// FromHz rounds a frequency to the nearest word. Frequencies below key 0's
// and above MaxWord's clamp to them, as the standard's range ends there.
func FromHz(hz float64) Word {
	switch Outside(hz) {
	case -1:
		return 0
	case 1:
		return MaxWord
	}
	return Word(stepsOf(hz))
}

// Outside says whether FromHz clamps a frequency: -1 below the standard's
// range, +1 above it, 0 within.
func Outside(hz float64) int {
	switch steps := stepsOf(hz); {
	case steps < 0:
		return -1
	case steps > float64(MaxWord):
		return 1
	}
	return 0
}

// stepsOf is the frequency in rounded steps above key 0, unclamped.
func stepsOf(hz float64) float64 {
	if !(hz > 0) { // also NaN
		return -1
	}
	return math.Round((keyA4 + 12*math.Log2(hz/440)) * Steps)
}

// Semitones is the word as a fractional MIDI key number (69 = 440 Hz).
func (w Word) Semitones() float64 { return float64(w) / Steps }

// Hz is the frequency the word names.
func (w Word) Hz() float64 { return 440 * math.Exp2((w.Semitones()-keyA4)/12) }

// Bytes is the word as sent: semitone, then the fraction's high and low
// seven bits, each below 0x80.
func (w Word) Bytes() [3]byte {
	return [3]byte{byte(w>>14) & 0x7F, byte(w>>7) & 0x7F, byte(w) & 0x7F}
}

// wordOf reads three data bytes; ok is false for the reserved "no change".
func wordOf(b []byte) (w Word, ok bool) {
	w = Word(b[0])<<14 | Word(b[1])<<7 | Word(b[2])
	return w, w != noChange
}
