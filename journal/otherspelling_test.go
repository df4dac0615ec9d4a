package journal

import (
	"strings"
	"testing"

	"fifthline/target"
)

// The contract's rule (interface.md, Alternative spelling): a note sits on
// the other spelling only when nearer the alternative's target and within a
// quarter of the gap between the two targets.
func TestOnOtherSpellingFollowsTheQuarterGapRule(t *testing.T) {
	cases := []struct {
		name            string
		cents, altCents float64
		want            bool
	}{
		// ¼-comma meantone: G♭ lies 41.06 ¢ above F♯ (the lesser diesis
		// 128/125, handbook value); an F♯5 played 38 ¢ high is 3 ¢ below G♭5.
		{"quarter-comma F# on Gb", 38, -3.06, true},
		// ⅙-comma: the fifth is 701.955 − 21.506/6 = 698.371 ¢, and 12 such
		// fifths fall 19.55 ¢ short of 7 octaves, the gap (hand-computed from
		// the definition); an F♯ pushed up 11 ¢ is 8.55 ¢ below G♭ — nearer
		// it, but past a quarter of the gap (4.9 ¢).
		{"sixth-comma leading tone pushed up", 11, -8.55, false},
		{"sixth-comma on the Gb", 16, -3.55, true},
		// Pythagorean: G♭ lies a Pythagorean comma (23.46 ¢) below F♯; an F♯
		// 12 ¢ low is 11.46 ¢ above G♭ — nearer, not within 5.9 ¢.
		{"pythagorean F# 12 low", -12, 11.46, false},
		{"in tune", 2, 43.06, false},
		{"both spellings share a pitch (equal temperament)", 3, 3, false},
	}
	for _, c := range cases {
		if got := target.SitsOnOther(c.cents, c.altCents); got != c.want {
			t.Errorf("%s: %v, want %v", c.name, got, c.want)
		}
	}
}

// A journal from before on_other_spelling is judged by the rule from its own
// cents and alt_cents; one that carries the column is read as written; a
// note offered no other spelling has empty alt_note and alt_cents.
func TestSatOnOtherOldAndNewJournals(t *testing.T) {
	var older, newer []string
	for _, h := range Header() {
		if !Later[h] {
			older = append(older, h)
		}
	}
	newer = append(append(newer, older...), "on_other_spelling")
	// line is a journal line under header: sampleLine's values, with the
	// given columns changed.
	sample := map[string]string{}
	for i, v := range strings.Split(sampleLine, ",") {
		sample[Header()[i]] = v
	}
	line := func(header []string, set map[string]string) string {
		var fields []string
		for _, h := range header {
			v, ok := set[h]
			if !ok {
				v = sample[h]
			}
			fields = append(fields, v)
		}
		return strings.Join(fields, ",") + "\n"
	}
	read := func(header []string, lines ...string) []Entry {
		t.Helper()
		es, warns, err := Read(strings.NewReader(strings.Join(header, ",")+"\n"+strings.Join(lines, "")), "j")
		if err != nil || len(warns) != 0 || len(es) != len(lines) {
			t.Fatalf("%d entries, %q, %v", len(es), warns, err)
		}
		return es
	}
	// ¼-comma F♯5 38 ¢ high is 3.06 ¢ below G♭5 (as above); ⅙-comma F♯
	// pushed up 11 ¢ is 8.55 ¢ below G♭, past a quarter of the gap.
	onGb := map[string]string{"note": "F#5", "cents": "38.00", "alt_note": "Gb5", "alt_cents": "-3.06", "same_pitch": "false"}
	pushed := map[string]string{"note": "F#4", "cents": "11.00", "alt_note": "Gb4", "alt_cents": "-8.55", "same_pitch": "false"}
	es := read(older, line(older, onGb), line(older, pushed))
	if !es[0].SatOnOther() || es[1].SatOnOther() || es[0].OnOtherKnown {
		t.Errorf("older journal: %v %v", es[0].SatOnOther(), es[1].SatOnOther())
	}
	with := func(m map[string]string, k, v string) map[string]string {
		out := map[string]string{k: v}
		for a, b := range m {
			if a != k {
				out[a] = b
			}
		}
		return out
	}
	none := map[string]string{"note": "G4", "alt_note": "", "alt_cents": ""} // a natural: no other spelling offered
	es = read(newer,
		line(newer, with(onGb, "on_other_spelling", "false")), // the verdict written stands
		line(newer, with(pushed, "on_other_spelling", "true")),
		line(newer, with(none, "on_other_spelling", "false")),
		line(newer, with(none, "on_other_spelling", "true"))) // claims a spelling it does not name
	for i, want := range []bool{false, true, false, false} {
		if got := es[i].SatOnOther(); got != want || !es[i].OnOtherKnown {
			t.Errorf("newer journal line %d: %v, want %v", i+1, got, want)
		}
	}
	if es[2].HasAlt || es[3].HasAlt || !es[0].HasAlt {
		t.Errorf("HasAlt %v %v %v", es[0].HasAlt, es[2].HasAlt, es[3].HasAlt)
	}
}
