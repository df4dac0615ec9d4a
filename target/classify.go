package target

import (
	"fmt"
	"math"
	"strconv"
)

// Reading is what a measured frequency means in a tuning: the window note
// whose target is nearest, how far from that target it is, and the same
// against the note's other spelling twelve fifths away.
type Reading struct {
	Hz       float64 // the measured frequency
	Note     Note    // the window note whose target is nearest (concert pitch)
	TargetHz float64
	Cents    float64 // 1200·log2(Hz / TargetHz)

	Alt      Note // Note respelled twelve fifths away (F♯ ↔ G♭), per the contract
	AltHz    float64
	AltCents float64 // the measured frequency against Alt's target

	// SamePitch is true where the temperament gives Note and Alt one pitch
	// (equal temperament, the well temperaments): then there is no other
	// spelling to be on, and AltCents equals Cents.
	SamePitch bool

	// Written and AltWritten are Note and Alt as a transposing instrument's
	// part shows them; equal to Note and Alt at concert pitch.
	Written, AltWritten Note
}

// samePitchCents is how close two targets must be to count as one pitch.
const samePitchCents = 1e-6

// Classify reads a measured frequency (hertz, > 0) in the tuning. A
// non-positive or non-finite frequency gives the zero Reading.
func (t Tuning) Classify(hz float64) Reading {
	if !(hz > 0) || math.IsInf(hz, 0) {
		return Reading{}
	}
	h := Cents(hz / t.c4())
	shift := t.shift()
	var best Note
	bestTarget, bestDist := 0.0, math.Inf(1)
	var buf [12]Note
	for _, n := range t.window(buf[:0]) {
		c := t.targetCents(n, shift)
		// Targets repeat by octaves, so the nearest octave of this
		// spelling is a shift away.
		k := math.Round((h - c) / 1200)
		n.Octave += int(k)
		c += 1200 * k
		if d := math.Abs(h - c); d < bestDist {
			best, bestTarget, bestDist = n, c, d
		}
	}
	r := Reading{Hz: hz, Note: best, TargetHz: t.hz(bestTarget), Cents: h - bestTarget}
	r.Alt = t.alternative(best, h, shift)
	altTarget := t.targetCents(r.Alt, shift)
	r.AltHz, r.AltCents = t.hz(altTarget), h-altTarget
	r.SamePitch = math.Abs(altTarget-bestTarget) < samePitchCents
	r.Written, r.AltWritten = t.Transpose.Written(r.Note), t.Transpose.Written(r.Alt)
	return r
}

// alternative is n respelled twelve fifths away: of the two respellings the
// one with fewer accidentals; on a tie, the one whose target is nearer the
// held pitch h (interface contract, "Alternative spelling").
func (t Tuning) alternative(n Note, h, shift float64) Note {
	up, down := n.respell(12), n.respell(-12)
	au, ad := abs(up.Accidental), abs(down.Accidental)
	switch {
	case au < ad:
		return up
	case ad < au:
		return down
	}
	if math.Abs(h-t.targetCents(up, shift)) <= math.Abs(h-t.targetCents(down, shift)) {
		return up
	}
	return down
}

// NearerAlt reports whether the held pitch sits nearer the other spelling's
// target than the one it was read as.
func (r Reading) NearerAlt() bool {
	return !r.SamePitch && math.Abs(r.AltCents) < math.Abs(r.Cents)
}

// Margin is how much nearer, in cents, the held pitch is to the spelling it was
// read as than to the other one; negative when it sits nearer the other.
func (r Reading) Margin() float64 { return math.Abs(r.AltCents) - math.Abs(r.Cents) }

// Verdict says in words where the held pitch sits, for screens and logs:
// "F#4 -3.2¢", "F#4 +38.1¢, sits on Gb4 (-2.9¢)", "G#4 +0.4¢ (Ab4 is the same pitch)".
func (r Reading) Verdict() string {
	if r.Hz == 0 {
		return "no pitch"
	}
	base := r.Written.String() + " " + FormatCents(r.Cents, 1)
	switch {
	case r.SamePitch:
		return fmt.Sprintf("%s (%s is the same pitch)", base, r.AltWritten)
	case r.NearerAlt():
		return fmt.Sprintf("%s, sits on %s (%s)", base, r.AltWritten, FormatCents(r.AltCents, 1))
	}
	return fmt.Sprintf("%s (%s would be %s)", base, r.AltWritten, FormatCents(r.AltCents, 1))
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

// FormatCents writes a signed number of cents with the given decimals and the
// cent sign ("+3.2¢", "-0.4¢"), never "-0.0¢".
func FormatCents(c float64, decimals int) string {
	s := strconv.FormatFloat(c, 'f', decimals, 64)
	if z, err := strconv.ParseFloat(s, 64); err == nil && z == 0 {
		s = strconv.FormatFloat(0, 'f', decimals, 64)
	}
	if s[0] != '-' {
		s = "+" + s
	}
	return s + "¢"
}
