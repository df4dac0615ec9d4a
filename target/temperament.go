package target

import (
	"fmt"
	"math"
	"strconv"
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

// Fifth bounds, both excluded: 7-EDO's fifth (685.714 ¢) and 5-EDO's
// (720 ¢). Between them both kinds of semitone are positive — the chromatic
// one (C to C♯, seven fifths less four octaves) and the diatonic one (C♯ to
// D, three octaves less five fifths) — so the twelve spellings of any window
// keep their order and stay apart; at 720 ¢ B♭ lands on A, at 685.714 ¢ C♯
// on C (the chain-of-fifths arithmetic; common practice).
const (
	MinFifth = 1200.0 * 4 / 7
	MaxFifth = 720.0
)

// fifthWorks reports whether a fifth lies strictly inside the bounds.
func fifthWorks(f float64) bool { return f > MinFifth+1e-9 && f < MaxFifth-1e-9 }

// NewRegular makes a regular temperament with the given fifth in cents.
func NewRegular(fifth float64) (Regular, error) {
	if !fifthWorks(fifth) {
		return Regular{}, fmt.Errorf("a fifth of %g ¢ puts the spellings out of order (B♭ reaches A at 720 ¢, C♯ reaches C at 685.714 ¢); fifths between %.3f and %.0f ¢ work", fifth, MinFifth, MaxFifth)
	}
	s := strconv.FormatFloat(fifth, 'f', -1, 64)
	return Regular{Fifth: fifth, spec: "fifth:" + s, name: "regular, fifth " + s + " ¢"}, nil
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
		return Regular{}, fmt.Errorf("meantone:%d/%d puts the spellings out of order; fractions of the comma between %.3f and %.3f work", num, den,
			(PureFifth-MaxFifth)/SyntonicComma, (PureFifth-MinFifth)/SyntonicComma)
	}
	r.spec = fmt.Sprintf("meantone:%d/%d", num, den)
	r.name = fmt.Sprintf("%d/%d-comma meantone", num, den)
	return r, nil
}

// EDO divides the octave into n equal steps and takes its best fifth (the
// step count nearest a pure fifth), so every spelling maps to a step: in
// 31-EDO the fifth is 18 steps and F♯ and G♭ are two steps apart. Divisions
// whose best fifth falls outside the fifth bounds (7, 14, 25, 35 among them)
// are refused with the list of those that work.
func EDO(n int) (Regular, error) {
	if n < 5 || n > maxEDO {
		return Regular{}, fmt.Errorf("edo:%d: divisions of the octave that work: %s", n, workingEDOs())
	}
	r, err := NewRegular(edoFifth(n))
	if err != nil {
		return Regular{}, fmt.Errorf("edo:%d: its best fifth, %.3f ¢, puts the spellings out of order; divisions that work: %s", n, edoFifth(n), workingEDOs())
	}
	if n == 12 {
		r.Fifth = 700 // exactly, so F♯ and G♭ compare equal
	}
	r.spec = fmt.Sprintf("edo:%d", n)
	r.name = fmt.Sprintf("%d-EDO", n)
	return r, nil
}

const maxEDO = 999

// edoFifth is n-EDO's best fifth in cents.
func edoFifth(n int) float64 {
	return 1200 * math.Round(float64(n)*PureFifth/1200) / float64(n)
}

// workingEDOs lists the divisions EDO accepts. Past 36 steps a division's
// best fifth is within 600/n < 16.3 ¢ of pure, inside the bounds, so every
// one works.
func workingEDOs() string {
	var s string
	for n := 5; n <= 36; n++ {
		if fifthWorks(edoFifth(n)) {
			s += strconv.Itoa(n) + ", "
		}
	}
	return s + "37 … " + strconv.Itoa(maxEDO)
}

// wrapCents brings c into [-600, 600).
func wrapCents(c float64) float64 { return c - 1200*math.Floor((c+600)/1200) }
