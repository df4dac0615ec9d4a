package main

import (
	"errors"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strings"

	"fifthline/target"
)

// musicalFlags are the contract's flags for every command that reads or plays
// notes, plus our extensions.
type musicalFlags struct {
	key, temperament, a4, anchor, chord, seventh, transpose string

	fs           *flag.FlagSet     // to tell given flags from defaults (config.go)
	origin       map[string]string // where each value came from (config.go)
	defaultsFrom string            // a command's own defaults, in place of the tuning files
}

func addMusicalFlags(fs *flag.FlagSet) *musicalFlags {
	m := &musicalFlags{fs: fs}
	fs.StringVar(&m.key, "key", "C major", "tonic and mode, e.g. \"G major\", \"f# minor\", \"D dorian\"")
	fs.StringVar(&m.temperament, "temperament", "equal", "equal, pythagorean, meantone:P/Q, fifth:CENTS, edo:N, werckmeister3, kirnberger3, vallotti, young, just, or a temperament file (names as the meter shows them work too: \"Werckmeister III\", \"quarter-comma\", \"31-EDO\")")
	fs.StringVar(&m.a4, "a4", "440", "reference pitch in Hz (380-480): A4 sits exactly here, except in just, which keeps its tonic where equal temperament puts it")
	fs.StringVar(&m.anchor, "anchor", "", "which note the reference fixes: a4, or tonic (kept where equal temperament puts it); default a4, tonic in just")
	fs.StringVar(&m.chord, "chord", "", "a held chord whose members are tuned just above its root, e.g. \"D major\", \"G harmonic7\"; a 7 or m7 chord's minor seventh at --seventh")
	addSeventhFlag(fs, &m.seventh)
	fs.StringVar(&m.transpose, "transpose", "", "show written pitch for a transposing instrument: the note a written C4 sounds, e.g. Bb, A, F, Eb, Eb4, Bb2")
	return m
}

// tuning turns the flags into a Tuning; every problem is a usage error.
func (m *musicalFlags) tuning() (target.Tuning, error) {
	var t target.Tuning
	err := m.applyFiles()
	if err != nil {
		return t, err
	}
	if t.Key, err = target.ParseKey(m.key); err != nil {
		return t, usageError{"--key: " + err.Error()}
	}
	if t.Temperament, err = parseTemperament(m.temperament); err != nil {
		return t, usageError{"--temperament: " + err.Error()}
	}
	if t.A4, err = target.ParseA4(m.a4); err != nil {
		return t, usageError{err.Error()}
	}
	if t.Anchor, err = target.ParseAnchor(m.anchor); err != nil {
		return t, usageError{"--anchor: " + err.Error()}
	}
	seventh, err := m.seventhRatio()
	if err != nil {
		return t, err
	}
	if m.chord != "" {
		if t.Chord, err = target.ParseChord(m.chord); err != nil {
			return t, usageError{"--chord: " + err.Error()}
		}
		t.Chord.Seventh = seventh
	}
	if t.Transpose, err = target.ParseTransposition(m.transpose); err != nil {
		return t, usageError{err.Error()}
	}
	return t, nil
}

// seventhRatio is --seventh's ratio, one for the declared chord and the
// heard ones; "" (flags set in code) is the default, as the flag's is.
func (m *musicalFlags) seventhRatio() (float64, error) {
	if m.seventh == "" {
		return target.DefaultSeventh, nil
	}
	r, err := target.ParseSeventh(m.seventh)
	if err != nil {
		return 0, usageError{err.Error()}
	}
	return r, nil
}

// addSeventhFlag defines --seventh, the minor seventh's just ratio for a
// declared chord and for the chords heard (--chords), once per flag set.
func addSeventhFlag(fs *flag.FlagSet, value *string) {
	if fs.Lookup("seventh") == nil {
		fs.StringVar(value, "seventh", "16/9", "the just ratio of a chord's minor seventh, declared (--chord) or heard (--players, --voices, demo --group; the journal keeps it): 7/4, 9/5 or 16/9")
	}
}

// parseTemperament reads a named temperament, or a temperament file when the
// spec names an existing file. An unknown name that looks like a path (it has
// a slash or a file extension) is reported as a missing file.
func parseTemperament(spec string) (target.Temperament, error) {
	tm, err := target.ParseTemperament(spec)
	if err == nil {
		return tm, nil
	}
	info, statErr := os.Stat(spec)
	switch {
	case statErr == nil && info.Mode().IsRegular():
		data, readErr := os.ReadFile(spec)
		if readErr != nil {
			return nil, fmt.Errorf("temperament file %q: %v", spec, errors.Unwrap(readErr))
		}
		return target.ParseCustom(spec, data)
	case statErr == nil && info.IsDir():
		return nil, fmt.Errorf("temperament file %q is a folder", spec)
	case errors.Is(err, target.ErrUnknownTemperament) && commaFraction.MatchString(spec):
		// "1/4" alone is the comma's fraction of a meantone, not a path.
		return nil, fmt.Errorf("unknown temperament %q (a meantone by that part of the comma is meantone:%s)", spec, strings.TrimSpace(spec))
	case errors.Is(err, target.ErrUnknownTemperament) && looksLikePath(spec):
		return nil, fmt.Errorf("temperament file %q: no such file", spec)
	}
	return nil, err
}

// commaFraction is a part of the comma written alone, "1/4", "2/7".
var commaFraction = regexp.MustCompile(`^\s*[0-9]+/[0-9]+\s*$`)

// looksLikePath tells a file meant as a temperament from a mistyped name.
func looksLikePath(s string) bool {
	return strings.ContainsAny(s, `/\`) || filepath.Ext(s) != "" || strings.HasPrefix(s, "~")
}
