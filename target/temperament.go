package target

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Temperament places every spelled pitch class. Offset is the pitch class's
// distance in cents from where equal temperament puts it, relative to C (or to
// the tonic, for temperaments built from it). Only differences of offsets
// matter: Tuning fixes the absolute pitch with its reference.
type Temperament interface {
	// Spec is the canonical --temperament text that makes this temperament.
	Spec() string
	// Name is a readable name for screens and reports.
	Name() string
	// Offset is the deviation from equal temperament, in cents, of the
	// spelled pitch class at place p on the line of fifths, in a key whose
	// tonic sits at place tonic.
	Offset(p, tonic int) float64
}

// Handbook intervals in cents, computed from their ratios.
var (
	// PureFifth is 3/2: 701.955 ¢.
	PureFifth = Cents(3.0 / 2)
	// PureThird is 5/4: 386.314 ¢.
	PureThird = Cents(5.0 / 4)
	// SyntonicComma is 81/80: 21.506 ¢, the gap between four pure fifths and
	// a pure major third plus two octaves.
	SyntonicComma = Cents(81.0 / 80)
	// PythagoreanComma is 3^12/2^19: 23.460 ¢, the gap by which twelve pure
	// fifths overshoot seven octaves.
	PythagoreanComma = 12*PureFifth - 7*1200
	// Schisma is the Pythagorean comma less the syntonic: 1.954 ¢.
	Schisma = PythagoreanComma - SyntonicComma
)

// Cents is the size of a frequency ratio in cents: 1200·log2(ratio).
func Cents(ratio float64) float64 { return 1200 * math.Log2(ratio) }

// Regular is a regular temperament: every fifth the same size, so each
// spelling along the line of fifths has a pitch of its own unless the chain
// closes (as in equal temperament, or an EDO).
type Regular struct {
	Fifth float64 // cents
	spec  string
	name  string
}

// Spec implements Temperament.
func (r Regular) Spec() string { return r.spec }

// Name implements Temperament.
func (r Regular) Name() string { return r.name }

// Offset implements Temperament: each step along the line of fifths adds the
// fifth's deviation from 700 ¢.
func (r Regular) Offset(p, _ int) float64 { return float64(p) * (r.Fifth - 700) }

// Fifth bounds: outside them the seven letters no longer fall in order (a
// sharp would sound below its natural, or a whole tone vanish). 7-EDO's fifth
// (685.714 ¢) and 5-EDO's (720 ¢) are the edges (common practice).
const (
	MinFifth = 1200.0 * 4 / 7
	MaxFifth = 720.0
)

// NewRegular makes a regular temperament with the given fifth in cents.
func NewRegular(fifth float64) (Regular, error) {
	if math.IsNaN(fifth) || fifth < MinFifth-1e-9 || fifth > MaxFifth+1e-9 {
		return Regular{}, fmt.Errorf("a fifth of %g cents is outside %.3f to %.0f, where the letters keep their order", fifth, MinFifth, MaxFifth)
	}
	s := strconv.FormatFloat(fifth, 'f', -1, 64)
	return Regular{Fifth: fifth, spec: "fifth:" + s, name: "regular, fifth " + s + "¢"}, nil
}

// Equal is twelve-tone equal temperament.
var Equal = Regular{Fifth: 700, spec: "equal", name: "equal temperament"}

// Pythagorean is the chain of pure 3/2 fifths.
var Pythagorean = Regular{Fifth: PureFifth, spec: "pythagorean", name: "Pythagorean"}

// Meantone narrows every fifth by num/den of the syntonic comma: ¼ gives pure
// major thirds, ⅓ pure minor thirds, ⅙ the common compromise.
func Meantone(num, den int) (Regular, error) {
	if den <= 0 {
		return Regular{}, fmt.Errorf("meantone:%d/%d: the denominator must be a positive whole number", num, den)
	}
	f := float64(num) / float64(den)
	r, err := NewRegular(PureFifth - f*SyntonicComma)
	if err != nil {
		return Regular{}, fmt.Errorf("meantone:%d/%d: %v", num, den, err)
	}
	r.spec = fmt.Sprintf("meantone:%d/%d", num, den)
	r.name = fmt.Sprintf("%d/%d-comma meantone", num, den)
	return r, nil
}

// EDO divides the octave into n equal steps and takes its best fifth (the
// step count nearest a pure fifth), so every spelling maps to a step: in
// 31-EDO the fifth is 18 steps and F♯ and G♭ are two steps apart.
func EDO(n int) (Regular, error) {
	if n < 5 || n > 999 {
		return Regular{}, fmt.Errorf("edo:%d: the octave must be divided into 5 to 999 steps", n)
	}
	steps := math.Round(float64(n) * PureFifth / 1200)
	r, err := NewRegular(1200 * steps / float64(n))
	if err != nil {
		return Regular{}, fmt.Errorf("edo:%d: its best fifth (%g steps): %v", n, steps, err)
	}
	if n == 12 {
		r.Fifth = 700 // exactly, so F♯ and G♭ compare equal
	}
	r.spec = fmt.Sprintf("edo:%d", n)
	r.name = fmt.Sprintf("%d-EDO", n)
	return r, nil
}

// Builtin lists the named temperaments ParseTemperament knows, in the order a
// screen cycles through them.
var Builtin = []string{"equal", "meantone:1/4", "meantone:1/6", "meantone:1/5", "meantone:1/3", "meantone:2/7",
	"pythagorean", "edo:31", "edo:19", "edo:53", "werckmeister3", "kirnberger3", "vallotti", "young", "just"}

// ParseTemperament reads a --temperament spec other than a file path:
// equal, pythagorean, meantone:P/Q, fifth:CENTS, edo:N, werckmeister3,
// kirnberger3, vallotti, young, just. Names are case-insensitive.
func ParseTemperament(spec string) (Temperament, error) {
	s := strings.ToLower(strings.TrimSpace(spec))
	switch s {
	case "equal", "12-tet", "et":
		return Equal, nil
	case "pythagorean":
		return Pythagorean, nil
	case "just":
		return Just{}, nil
	}
	if c, ok := circulating[s]; ok {
		return c, nil
	}
	kind, arg, ok := strings.Cut(s, ":")
	if !ok {
		return nil, fmt.Errorf("unknown temperament %q (try equal, meantone:1/4, edo:31, werckmeister3, just, or a temperament file)", spec)
	}
	switch kind {
	case "meantone":
		ns, ds, ok := strings.Cut(arg, "/")
		num, err1 := strconv.Atoi(strings.TrimSpace(ns))
		den, err2 := strconv.Atoi(strings.TrimSpace(ds))
		if !ok || err1 != nil || err2 != nil {
			return nil, fmt.Errorf("temperament %q: write meantone:P/Q with whole numbers, like meantone:1/4", spec)
		}
		return Meantone(num, den)
	case "fifth":
		f, err := strconv.ParseFloat(strings.TrimSpace(arg), 64)
		if err != nil || math.IsInf(f, 0) {
			return nil, fmt.Errorf("temperament %q: the fifth must be a number of cents, like fifth:696.5", spec)
		}
		r, err := NewRegular(f)
		if err != nil {
			return nil, fmt.Errorf("temperament %q: %v", spec, err)
		}
		return r, nil
	case "edo":
		n, err := strconv.Atoi(strings.TrimSpace(arg))
		if err != nil {
			return nil, fmt.Errorf("temperament %q: write edo:N with a whole number, like edo:31", spec)
		}
		return EDO(n)
	}
	return nil, fmt.Errorf("unknown temperament %q", spec)
}

// wrapCents brings c into [-600, 600).
func wrapCents(c float64) float64 { return c - 1200*math.Floor((c+600)/1200) }
