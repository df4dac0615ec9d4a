package target

import (
	"fmt"
	"math/big"
)

// Just is 5-limit just intonation built from the tonic. Each spelling q
// fifths from the tonic gets the ratio 3^a·5^b (octave-reduced) with
// q = a + 4b and a in -1…2: a grid of four fifths (IV I V II) by rows of pure
// major thirds. Its twelve central members are A. J. Ellis's "duodene" (in his
// translation of Helmholtz, On the Sensations of Tone, 1885): in C major
// D♭ 16/15, D 9/8, E♭ 6/5, E 5/4, F 4/3, F♯ 45/32, G 3/2, A♭ 8/5, A 5/3,
// B♭ 9/5, B 15/8; beyond them C♯ 25/24, G♯ 25/16, D♯ 75/64, A♯ 225/128,
// G♭ 36/25. In a minor key the same rule gives pure minor triads on the
// tonic, fourth and fifth degrees (A minor: C 6/5, F 8/5, G 9/5).
type Just struct{}

// Spec implements Temperament.
func (Just) Spec() string { return "just" }

// Name implements Temperament.
func (Just) Name() string { return "5-limit just from the tonic" }

// justPowers is the rule above: the exponents of 3 and 5 for a spelling q
// fifths above the tonic.
func justPowers(q int) (a, b int) {
	b = floorDiv(q+1, 4)
	return q - 4*b, b
}

// Offset implements Temperament: each factor 3 is 1.955 ¢ wider than its
// nineteen equal semitones, each factor 5 13.686 ¢ narrower than its 28.
func (Just) Offset(p, tonic int) float64 {
	a, b := justPowers(p - tonic)
	return float64(a)*(Cents(3)-1900) + float64(b)*(Cents(5)-2800)
}

// JustRatio is the octave-reduced ratio above the tonic that Just gives the
// spelling q fifths above it, as a fraction such as "45/32".
func JustRatio(q int) string {
	a, b := justPowers(q)
	r := new(big.Rat).SetInt64(1)
	mul := func(n int64, e int) {
		f := big.NewRat(n, 1)
		if e < 0 {
			f.Inv(f)
			e = -e
		}
		for range e {
			r.Mul(r, f)
		}
	}
	mul(3, a)
	mul(5, b)
	one, two := big.NewRat(1, 1), big.NewRat(2, 1)
	for r.Cmp(one) < 0 {
		r.Mul(r, two)
	}
	for r.Cmp(two) >= 0 {
		r.Quo(r, two)
	}
	return fmt.Sprint(r.RatString())
}
