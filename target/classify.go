package target

import (
	"fmt"
	"math"
)

// Reading is what a measured frequency means in a tuning: the window note
// whose target is nearest, how far from that target it is, and the same
// against the note's other spelling twelve fifths away.
//
// Three kinds of cents appear in this package, each under its own name: the
// size of a ratio (Cents), a pitch as cents above the reference's
// equal-tempered C4 (Tuning.TargetPitch), and a signed distance of a held
// pitch from a target (Reading.Deviation).
type Reading struct {
	Hz        float64 // the measured frequency
	Note      Note    // the window note whose target is nearest (concert pitch)
	TargetHz  float64
	Deviation float64 // 1200·log2(Hz / TargetHz): + sharp, − flat

	// HasAlt is false where no other spelling is offered (a natural D, G
	// or A, whose respellings carry two accidentals more); then Alt, AltHz
	// and AltDeviation are zero.
	HasAlt       bool
	Alt          Note // Note respelled twelve fifths away (F♯ ↔ G♭), per the contract
	AltHz        float64
	AltDeviation float64 // the measured frequency against Alt's target

	// SamePitch is true where the temperament gives Note and Alt one pitch
	// (equal temperament, the well temperaments): then there is no other
	// spelling to be on, and AltDeviation equals Deviation.
	SamePitch bool

	// OnOther is true when the held pitch sits on the other spelling: nearer
	// Alt's target than Note's, and within a quarter of the gap between the
	// two (interface contract, "Alternative spelling").
	OnOther bool

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
		c := t.targetPitch(n, shift)
		// Targets repeat by octaves, so the nearest octave of this
		// spelling is a shift away.
		k := math.Round((h - c) / 1200)
		n.Octave += int(k)
		c += 1200 * k
		if d := math.Abs(h - c); d < bestDist {
			best, bestTarget, bestDist = n, c, d
		}
	}
	return t.reading(hz, h, best, bestTarget, shift)
}

// ReadAs reads a measured frequency (hertz, > 0) as the note n is spelled,
// in n's octave nearest the pitch, with its other spelling as Classify
// gives it: a chord member spelled from its root (G♯ as the third of E major
// in F major, interface contract, "Spelling window") rather than as the
// window spells its pitch class. A non-positive or non-finite frequency
// gives the zero Reading.
func (t Tuning) ReadAs(n Note, hz float64) Reading {
	if !(hz > 0) || math.IsInf(hz, 0) {
		return Reading{}
	}
	h := Cents(hz / t.c4())
	shift := t.shift()
	c := t.targetPitch(n, shift)
	k := math.Round((h - c) / 1200)
	n.Octave += int(k)
	return t.reading(hz, h, n, c+1200*k, shift)
}

// reading is the Reading of the pitch h (cents above the reference's
// equal-tempered C4) read as note n, whose target is at pitch target.
func (t Tuning) reading(hz, h float64, n Note, target, shift float64) Reading {
	r := Reading{Hz: hz, Note: n, TargetHz: t.hz(target), Deviation: h - target}
	r.Written = t.Transpose.Written(r.Note)
	if r.Alt, r.HasAlt = Alternative(n); !r.HasAlt {
		return r
	}
	// The other spelling lies the temperament's gap between the two from
	// the note's target: under a declared chord the member's target is just
	// above the root, and in equal temperament the G♯ of E major and A♭ are
	// still one pitch (interface contract, "Alternative spelling").
	gap := t.tempered(r.Alt) - t.tempered(n)
	if r.SamePitch = math.Abs(gap) < samePitchCents; r.SamePitch {
		gap = 0
	}
	altTarget := target + gap
	r.AltHz, r.AltDeviation = t.hz(altTarget), h-altTarget
	r.AltWritten = t.Transpose.Written(r.Alt)
	r.OnOther = !r.SamePitch && SitsOnOther(r.Deviation, r.AltDeviation)
	return r
}

// SitsOnOther is the contract's rule ("Alternative spelling") for a held
// pitch read deviation cents from its note's target and altDeviation from
// the other spelling's: it sits on the other spelling only when nearer that
// target and within a quarter of the gap between the two targets. Both are
// measured from the same pitch, so the gap is deviation − altDeviation; where
// it is 0 (one pitch for both spellings) the pitch never sits on the other.
// Journals older than the on_other_spelling column are judged by it too.
func SitsOnOther(deviation, altDeviation float64) bool {
	gap := math.Abs(deviation - altDeviation)
	return gap > 0 && math.Abs(altDeviation) < math.Abs(deviation) && math.Abs(altDeviation) <= gap/4
}

// Alternative is n respelled twelve fifths away (interface contract,
// "Alternative spelling"): of the two respellings, the one with fewer
// accidentals; none when that one carries two accidentals more than n.
//
// The contract breaks a tie in accidentals by the nearer target, but no tie
// survives the two-accidental rule: the two respellings differ by three or
// four accidentals, so they tie only as a double sharp against a double flat,
// which happens for D, G and A alone (C𝄪/E𝄫, F𝄪/A𝄫, G𝄪/B𝄫), and those
// naturals are offered none. So the alternative depends on the note alone,
// never on the held pitch, and cannot flip while a note is held
// (TestAlternativeDependsOnTheNoteAlone).
func Alternative(n Note) (Note, bool) {
	alt := n.respell(12)
	if down := n.respell(-12); abs(down.Accidental) < abs(alt.Accidental) {
		alt = down
	}
	if abs(alt.Accidental) >= abs(n.Accidental)+2 {
		return Note{}, false
	}
	return alt, true
}

// nearerAlt reports whether the held pitch is nearer the other spelling's
// target than the one it was read as.
func (r Reading) nearerAlt() bool {
	return r.HasAlt && !r.SamePitch && math.Abs(r.AltDeviation) < math.Abs(r.Deviation)
}

// TowardOther reports whether the held pitch lies between the two targets,
// nearer the other spelling's without sitting on it: the words then say
// "sharp, toward G♭", never "on G♭". Past the other target it is not toward
// it, and the words give the distance from it instead.
func (r Reading) TowardOther() bool {
	between := r.Deviation*r.AltDeviation < 0
	return between && r.nearerAlt() && !r.OnOther
}

// OtherWords says in a few words where the held pitch stands against the
// other spelling, for screens and logs: "sits on Gb4 (-2.9¢)", "toward Gb4",
// "Gb4 would be +38.1¢"; "" when none is offered or the temperament gives
// both spellings one pitch (which the tuning's description says once).
func (r Reading) OtherWords() string {
	switch {
	case !r.HasAlt || r.SamePitch:
		return ""
	case r.OnOther:
		return fmt.Sprintf("sits on %s (%s)", r.AltWritten, FormatCents(r.AltDeviation, 1))
	case r.TowardOther():
		return "toward " + r.AltWritten.String()
	}
	return fmt.Sprintf("%s would be %s", r.AltWritten, FormatCents(r.AltDeviation, 1))
}

// Verdict says in words where the held pitch sits, for screens and logs:
// "F#4 -3.2¢ (Gb4 would be -44.3¢)", "F#4 +38.1¢, sits on Gb4 (-2.9¢)",
// "F#4 +11.0¢, toward Gb4", "G4 +0.4¢".
func (r Reading) Verdict() string {
	if r.Hz == 0 {
		return "no pitch"
	}
	base := r.Written.String() + " " + FormatCents(r.Deviation, 1)
	switch w := r.OtherWords(); {
	case w == "":
		return base
	case r.OnOther || r.TowardOther():
		return base + ", " + w
	default:
		return base + " (" + w + ")"
	}
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

// FormatCents writes a signed number of cents with the given decimals and the
// cent sign after a space, as every line of text writes cents ("+3.2 ¢",
// "-0.4 ¢"), and "0.0 ¢" for what rounds to nothing, never "-0.0 ¢".
func FormatCents(c float64, decimals int) string { return Signed(c, decimals) + " ¢" }
