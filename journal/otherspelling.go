package journal

import "math"

// SitsOnOther is the contract's rule for a reading that sits on the other
// spelling: the held pitch is nearer the alternative's target and within a
// quarter of the gap between the two targets. The gap comes from the
// reading itself: cents − alt_cents = 1200·log2(alt target / target), since
// both are measured from the same held pitch; where it is 0 (both spellings
// share one pitch) the reading never sits on the other spelling.
func SitsOnOther(cents, altCents float64) bool {
	gap := math.Abs(cents - altCents)
	return gap > 0 && math.Abs(altCents) < math.Abs(cents) && math.Abs(altCents) <= gap/4
}

// SatOnOther reports whether the note sat on its other spelling: the
// journal's on_other_spelling where it has that column, else the rule
// applied to the line's own cents and alt_cents (journals written before
// the column). A line that claims the other spelling but names none has
// not sat on it.
func (e Entry) SatOnOther() bool {
	if e.OnOtherKnown {
		return e.OnOther && e.HasAlt
	}
	return e.HasAlt && !e.SamePitch && SitsOnOther(e.Cents, e.AltCents)
}
