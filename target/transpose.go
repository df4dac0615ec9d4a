package target

import (
	"fmt"
	"strings"
)

// Transposition maps concert pitch to what a transposing instrument's part
// shows. Interval is written minus sounding; the zero value is concert pitch.
type Transposition struct {
	Name     string // as given, e.g. "Bb"
	Interval Interval
}

// IsConcert reports whether the transposition leaves notes as they sound.
func (t Transposition) IsConcert() bool { return t.Interval == Interval{} }

// Written is the note a player of this instrument reads for concert note n,
// spelled by interval: for a B♭ instrument concert B♭4 reads as C5.
func (t Transposition) Written(n Note) Note { return n.Transpose(t.Interval) }

// Concert is the inverse of Written.
func (t Transposition) Concert(n Note) Note {
	return n.Transpose(Interval{Fifths: -t.Interval.Fifths, Octaves: -t.Interval.Octaves})
}

// ParseTransposition reads a --transpose value: the note that sounds when
// the instrument plays a written C4. Without an octave it is the nearest such
// note at or below C4 — right for B♭ and A clarinets, F horn and E♭ alto
// saxophone. Give the octave when the instrument sounds otherwise: "Eb4" for
// the E♭ clarinet, "Bb2" for tenor saxophone and bass clarinet. "C" or
// "concert" means no transposition.
func ParseTransposition(s string) (Transposition, error) {
	t := strings.TrimSpace(s)
	if t == "" || strings.EqualFold(t, "concert") {
		return Transposition{}, nil
	}
	n, rest, err := parseName(t)
	if err != nil {
		return Transposition{}, fmt.Errorf("--transpose %q: %v", s, err)
	}
	if rest == "" {
		n.Octave = 4
		if n.Semitones() > 0 {
			n.Octave = 3
		}
	} else if n, err = ParseNote(t); err != nil {
		return Transposition{}, fmt.Errorf("--transpose %q: %v", s, err)
	}
	return Transposition{Name: t, Interval: Between(n, Note{Letter: C, Octave: 4})}, nil
}
