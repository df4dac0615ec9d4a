package target

import "math"

// Circulating is a well temperament: twelve fifths of different sizes that
// close the circle, so that every key is playable but each has its own colour.
// Enharmonic spellings share one pitch class.
type Circulating struct {
	spec, name string
	class      [12]float64 // cents above C for chain places C, G, D … F
}

// Spec implements Temperament.
func (c Circulating) Spec() string { return c.spec }

// Name implements Temperament.
func (c Circulating) Name() string { return c.name }

// Offset implements Temperament.
func (c Circulating) Offset(p, _ int) float64 {
	return wrapCents(c.class[mod(p, 12)] - 100*float64(mod(7*p, 12)))
}

// Classes is the twelve pitch classes in cents above C, in chromatic order
// C, C♯ … B.
func (c Circulating) Classes() [12]float64 {
	var out [12]float64
	for i, v := range c.class {
		out[mod(7*i, 12)] = v
	}
	return out
}

// newCirculating builds a well temperament from its definition: narrow[i] is
// how much the fifth from chain place i (C-G, G-D, … F-C) is narrowed below
// pure, in cents. The narrowings must add up to the Pythagorean comma.
func newCirculating(spec, name string, narrow [12]float64) Circulating {
	c := Circulating{spec: spec, name: name}
	pitch := 0.0
	for i := range 12 {
		c.class[i] = math.Mod(pitch, 1200)
		pitch = c.class[i] + PureFifth - narrow[i]
	}
	return c
}

// narrowing builds a narrow table: the listed chain places get amount each.
func narrowing(amount float64, places ...int) [12]float64 {
	var n [12]float64
	for _, p := range places {
		n[p] += amount
	}
	return n
}

// Chain places of the fifths, named by their lower note.
const (
	fifthC = iota
	fifthG
	fifthD
	fifthA
	fifthE
	fifthB
	fifthFs
	fifthCs
	fifthGs
	fifthEb
	fifthBb
	fifthF
)

var circulating = map[string]Circulating{
	// Werckmeister (1691), his third: C-G, G-D, D-A and B-F♯ narrowed by a
	// quarter of the Pythagorean comma, the rest pure.
	"werckmeister3": newCirculating("werckmeister3", "Werckmeister III",
		narrowing(PythagoreanComma/4, fifthC, fifthG, fifthD, fifthB)),
	// Kirnberger (1779), his third: C-G, G-D, D-A, A-E narrowed by a quarter
	// of the syntonic comma, F♯-C♯ by the schisma, the rest pure.
	"kirnberger3": func() Circulating {
		n := narrowing(SyntonicComma/4, fifthC, fifthG, fifthD, fifthA)
		n[fifthFs] = Schisma
		return newCirculating("kirnberger3", "Kirnberger III", n)
	}(),
	// Vallotti: the six fifths F-C through E-B narrowed by a sixth of the
	// Pythagorean comma, the rest pure.
	"vallotti": newCirculating("vallotti", "Vallotti",
		narrowing(PythagoreanComma/6, fifthF, fifthC, fifthG, fifthD, fifthA, fifthE)),
	// Thomas Young (1799), his second: C-G through B-F♯ narrowed by a sixth of
	// the Pythagorean comma, the rest pure.
	"young": newCirculating("young", "Young II",
		narrowing(PythagoreanComma/6, fifthC, fifthG, fifthD, fifthA, fifthE, fifthB)),
}
