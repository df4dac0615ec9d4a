package journal

import "fifthline/target"

// SatOnOther reports whether the note sat on its other spelling: the
// journal's on_other_spelling where it has that column, else the rule
// applied to the line's own cents and alt_cents (journals written before
// the column). A line that claims the other spelling but names none has
// not sat on it.
func (e Entry) SatOnOther() bool {
	if e.OnOtherKnown {
		return e.OnOther && e.HasAlt
	}
	return e.HasAlt && !e.SamePitch && target.SitsOnOther(e.Cents, e.AltCents)
}
