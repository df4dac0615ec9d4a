package target

import (
	"bufio"
	"bytes"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
)

// Custom is a temperament read from a file of our own small format (see
// ParseCustom). It is either regular (one fifth size) or a table of spelled
// pitches; in a table, a spelling not listed takes the pitch of the listed
// spelling of its pitch class nearest on the line of fifths.
type Custom struct {
	spec, name string
	regular    *Regular
	pitch      map[int]float64 // line-of-fifths place → cents above C
}

// Spec implements Temperament: the file's path as given.
func (c Custom) Spec() string { return c.spec }

// Name implements Temperament.
func (c Custom) Name() string { return c.name }

// Offset implements Temperament.
func (c Custom) Offset(p, tonic int) float64 {
	if c.regular != nil {
		return c.regular.Offset(p, tonic)
	}
	best, dist := 0, math.MaxInt
	for q := range c.pitch {
		if mod(q-p, 12) != 0 {
			continue
		}
		// Ties (a spelling midway between two listed ones) go to the flatter
		// side, whatever order the map yields.
		if d := abs(q - p); d < dist || d == dist && q < best {
			best, dist = q, d
		}
	}
	return wrapCents(c.pitch[best] - 100*float64(mod(7*p, 12)))
}

// ParseCustom reads a temperament file. The format, line by line:
//
//	# comments start with a hash, anywhere on a line
//	name = Chapel organ, 2024 restoration
//	fifth = 696.8            # a regular temperament: every fifth this many cents
//
// or, instead of fifth, one line per spelled pitch class giving its pitch above
// C, in cents or as a ratio:
//
//	C  = 0
//	C# = 76.0
//	D  = 9/8
//	Eb = 310.3
//	D# = 269.0               # a split key: D♯ and E♭ sound apart
//
// All twelve pitch classes must be listed. Errors name the line. spec is the
// path the file was given as, used as its Spec and (without a name line) its
// Name.
func ParseCustom(spec string, data []byte) (Custom, error) {
	c := Custom{spec: spec, name: spec, pitch: map[int]float64{}}
	fail := func(line int, format string, args ...any) (Custom, error) {
		return Custom{}, fmt.Errorf("%s line %d: %s", spec, line, fmt.Sprintf(format, args...))
	}
	sc := bufio.NewScanner(bytes.NewReader(data))
	line, fifthLine, firstNote := 0, 0, 0
	for sc.Scan() {
		line++
		text := strings.TrimSpace(stripComment(sc.Text()))
		if text == "" {
			continue
		}
		k, v, ok := strings.Cut(text, "=")
		k, v = strings.TrimSpace(k), strings.TrimSpace(v)
		if !ok || k == "" || v == "" {
			return fail(line, "expected \"name = value\", got %q", text)
		}
		switch strings.ToLower(k) {
		case "name":
			c.name = v
			continue
		case "fifth":
			f, err := strconv.ParseFloat(v, 64)
			if err != nil {
				return fail(line, "fifth %q is not a number of cents", v)
			}
			r, err := NewRegular(f)
			if err != nil {
				return fail(line, "%v", err)
			}
			c.regular, fifthLine = &r, line
			continue
		}
		n, err := ParseName(k)
		if err != nil {
			return fail(line, "%v", err)
		}
		cents, err := parsePitch(v)
		if err != nil {
			return fail(line, "%s: %v", k, err)
		}
		if _, dup := c.pitch[n.Fifths()]; dup {
			return fail(line, "%s is listed twice", k)
		}
		if firstNote == 0 {
			firstNote = line
		}
		c.pitch[n.Fifths()] = cents
	}
	if err := sc.Err(); err != nil {
		return Custom{}, fmt.Errorf("%s: %v", spec, err)
	}
	switch {
	case c.regular != nil && len(c.pitch) > 0:
		return fail(max(fifthLine, firstNote), "give either a fifth or a table of notes, not both")
	case c.regular != nil:
		return c, nil
	case len(c.pitch) == 0:
		return fail(line, "no fifth and no notes: nothing to tune by")
	}
	if missing := c.missingClasses(); len(missing) > 0 {
		return fail(line, "pitch classes missing from the table: %s", strings.Join(missing, " "))
	}
	return c, nil
}

var chromaticNames = [12]string{"C", "C#/Db", "D", "D#/Eb", "E", "F", "F#/Gb", "G", "G#/Ab", "A", "A#/Bb", "B"}

func (c Custom) missingClasses() []string {
	var have [12]bool
	for p := range c.pitch {
		have[mod(7*p, 12)] = true
	}
	var out []string
	for i, ok := range have {
		if !ok {
			out = append(out, chromaticNames[i])
		}
	}
	sort.Strings(out)
	return out
}

// parsePitch reads cents ("386.3") or a ratio ("5/4") as cents in [0, 1200).
func parsePitch(v string) (float64, error) {
	var c float64
	if a, b, ok := strings.Cut(v, "/"); ok {
		num, err1 := strconv.ParseFloat(strings.TrimSpace(a), 64)
		den, err2 := strconv.ParseFloat(strings.TrimSpace(b), 64)
		if err1 != nil || err2 != nil || !(num > 0) || !(den > 0) || math.IsInf(num, 0) || math.IsInf(den, 0) {
			return 0, fmt.Errorf("ratio %q must be two positive numbers, like 5/4", v)
		}
		c = Cents(num / den)
	} else {
		f, err := strconv.ParseFloat(v, 64)
		if err != nil || math.IsInf(f, 0) || math.IsNaN(f) {
			return 0, fmt.Errorf("%q is neither cents nor a ratio", v)
		}
		c = f
	}
	if !(c >= 0 && c < 1200) {
		return 0, fmt.Errorf("%q lies outside the octave above C (0 to 1200 cents)", v)
	}
	return c, nil
}

// stripComment cuts a comment off a line. A comment starts with a '#' at the
// start of the line or after white space; a '#' right after a letter is a
// sharp ("C# = 90 # Werckmeister's value" keeps "C# = 90").
func stripComment(s string) string {
	for i := 0; i < len(s); i++ {
		if s[i] == '#' && (i == 0 || s[i-1] == ' ' || s[i-1] == '\t') {
			return s[:i]
		}
	}
	return s
}
