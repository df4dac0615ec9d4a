package journal

import (
	"bufio"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"

	"fifthline/target"
)

// Entry is one held note read back from a journal. Note and Alt are as the
// player read them (written pitch for a transposing instrument).
type Entry struct {
	Time                              time.Time
	Session, Source, Player           string
	Key, Temperament                  string // as given to --key and --temperament (spec)
	A4                                float64
	Transpose, Chord                  string
	Start, End                        float64 // seconds within the session's run
	Note, Alt                         target.Note
	HasAlt                            bool // alt_note given: an other spelling was offered
	Hz, TargetHz, Cents, AltCents     float64
	SamePitch                         bool
	Spread, VibratoWidth, VibratoRate float64
	// OnOther is the on_other_spelling column (the contract's quarter-gap
	// rule); OnOtherKnown is false in journals older than that column.
	OnOther, OnOtherKnown bool
	// Voice is the voice's number with --voices. A chord membership row
	// (HeardChord not empty) is not a note of its own: see Extra.
	Voice, HeardChord, Member string
	JustCents                 float64
	// JustRatio is the just ratio the member was judged against ("16/9");
	// empty in journals older than the just_ratio column.
	JustRatio string
	// Reference: the lowest sounding root, which JustCents of the chord's
	// other members are measured from (its own just_cents is empty).
	Reference bool
	// Channel is the player's channel with --players, counted from 1; 0
	// where the journal does not say (older journals, one player).
	Channel int
	// Anchor is the note the reference placed: "a4" or "tonic"; in
	// journals older than the anchor column, the temperament's own (tonic
	// in just, a4 otherwise), as it was then.
	Anchor string
}

// NearerAlt reports whether the note sat nearer its other spelling's target
// (never where both spellings share one pitch).
func (e Entry) NearerAlt() bool {
	return e.HasAlt && !e.SamePitch && math.Abs(e.AltCents) < math.Abs(e.Cents)
}

// maxWarnings bounds the warnings one journal gives; the rest are counted.
const maxWarnings = 10

// ReadFile reads the journal at path; see Read. Errors name the path.
func ReadFile(path string) ([]Entry, []string, error) {
	info, err := os.Stat(path)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil, nil, fmt.Errorf("journal %s: no such file", path)
	case err != nil:
		return nil, nil, fmt.Errorf("journal %s: %v", path, unwrapPath(err))
	case info.IsDir():
		return nil, nil, fmt.Errorf("journal %s is a folder, not a file", path)
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, nil, fmt.Errorf("journal %s: %v", path, unwrapPath(err))
	}
	defer f.Close()
	return Read(f, path)
}

// maxHeader is the longest first line Read takes for a header.
const maxHeader = 64 << 10

// Read parses a journal; name is used in messages. A first line that is not
// a journal header is an error. A line that cannot be read — a torn last line
// left by a crash, or one damaged by hand — is skipped with a warning, so one
// bad line never costs the rest. Repeated header lines (journals joined with
// cat) and blank lines are passed over quietly.
func Read(r io.Reader, name string) ([]Entry, []string, error) {
	// The header is checked before the rest is read, so that a file that
	// is no journal (a recording, /dev/zero) is refused at once rather than
	// read whole.
	br := bufio.NewReaderSize(r, maxHeader)
	head, err := br.ReadSlice('\n')
	switch {
	case errors.Is(err, bufio.ErrBufferFull):
		return nil, nil, fmt.Errorf("journal %s is not a fifthline journal: its first line is longer than %d KiB", name, maxHeader>>10)
	case err != nil && !errors.Is(err, io.EOF):
		return nil, nil, fmt.Errorf("journal %s: %v", name, unwrapPath(err))
	}
	first := strings.TrimSuffix(strings.TrimPrefix(string(head), "\uFEFF"), "\n") // a spreadsheet may add a byte-order mark
	if strings.TrimSpace(first) == "" {
		if more, _ := io.ReadAll(io.LimitReader(br, maxHeader)); strings.TrimSpace(string(more)) == "" {
			return nil, nil, fmt.Errorf("journal %s is empty (no header line)", name)
		}
	}
	cols, err := columnIndex(strings.TrimSuffix(first, "\r"))
	if err != nil {
		return nil, nil, fmt.Errorf("journal %s is not a fifthline journal: %v", name, err)
	}
	rest, err := io.ReadAll(br)
	if err != nil {
		return nil, nil, fmt.Errorf("journal %s: %v", name, unwrapPath(err))
	}
	lines := append([]string{first}, strings.Split(string(rest), "\n")...)
	var entries []Entry
	var warns []string
	skipped := 0
	for i, line := range lines[1:] {
		line = strings.TrimSuffix(line, "\r")
		if strings.TrimSpace(line) == "" || line == lines[0] {
			continue
		}
		if strings.HasPrefix(line, "time,") { // a journal appended to under a newer header
			if c, err := columnIndex(line); err == nil {
				lines[0], cols = line, c
				continue
			}
		}
		e, err := cols.parse(line)
		if err == nil {
			entries = append(entries, e)
			continue
		}
		if skipped++; skipped > maxWarnings {
			continue
		}
		what := err.Error()
		if i == len(lines)-2 { // the file ends without a newline after it
			what = "incomplete last line (a session cut short?)"
		}
		warns = append(warns, fmt.Sprintf("journal %s line %d: %s; skipped", name, i+2, what))
	}
	if skipped > maxWarnings {
		warns = append(warns, fmt.Sprintf("journal %s: %d more unreadable lines skipped", name, skipped-maxWarnings))
	}
	return entries, warns, nil
}

// columns maps each journal column to its place in the file's header.
type columns struct {
	at    map[string]int
	count int
}

func columnIndex(header string) (columns, error) {
	fields, err := splitLine(header)
	if err != nil {
		return columns{}, fmt.Errorf("its first line is not a header (%v)", err)
	}
	c := columns{at: map[string]int{}, count: len(fields)}
	for i, f := range fields {
		c.at[strings.TrimSpace(f)] = i
	}
	var missing []string
	needed := 0
	for _, h := range Header() {
		if Later[h] {
			continue
		}
		needed++
		if _, ok := c.at[h]; !ok {
			missing = append(missing, h)
		}
	}
	if len(missing) == needed {
		return columns{}, notAHeader(header)
	}
	if len(missing) > 0 {
		return columns{}, fmt.Errorf("columns missing: %s", strings.Join(missing, ", "))
	}
	return c, nil
}

func splitLine(line string) ([]string, error) {
	cr := csv.NewReader(strings.NewReader(line))
	cr.FieldsPerRecord = -1
	rec, err := cr.Read()
	if err != nil {
		var pe *csv.ParseError
		if errors.As(err, &pe) {
			err = pe.Err
		}
		return nil, err
	}
	return rec, nil
}

// fieldReader reads typed fields of one line, keeping the first problem.
type fieldReader struct {
	c   columns
	rec []string
	err error
}

func (f *fieldReader) str(col string) string { return f.rec[f.c.at[col]] }

func (f *fieldReader) num(col string) float64 {
	s := strings.TrimSpace(f.str(col))
	x, err := strconv.ParseFloat(s, 64)
	if f.err == nil && (err != nil || math.IsNaN(x) || math.IsInf(x, 0)) {
		f.err = fmt.Errorf("%s %q is not a number", col, s)
	}
	return x
}

func (f *fieldReader) note(col string) target.Note {
	n, err := target.ParseNote(strings.TrimSpace(f.str(col)))
	if f.err == nil && err != nil {
		f.err = fmt.Errorf("%s: %v", col, err)
	}
	return n
}

func (f *fieldReader) when(col string) time.Time {
	t, err := time.Parse(time.RFC3339, strings.TrimSpace(f.str(col)))
	if f.err == nil && err != nil {
		f.err = fmt.Errorf("%s %q is not an ISO 8601 time", col, f.str(col))
	}
	return t
}

func (f *fieldReader) flag(col string) bool {
	b, err := strconv.ParseBool(strings.TrimSpace(f.str(col)))
	if f.err == nil && err != nil {
		f.err = fmt.Errorf("%s %q is not true or false", col, f.str(col))
	}
	return b
}

func (c columns) parse(line string) (Entry, error) {
	rec, err := splitLine(line)
	if err != nil {
		return Entry{}, err
	}
	if len(rec) != c.count {
		return Entry{}, fmt.Errorf("%d fields where the header has %d", len(rec), c.count)
	}
	f := &fieldReader{c: c, rec: rec}
	e := Entry{
		Time: f.when("time"), Session: f.str("session"), Source: f.str("source"), Player: f.str("player"),
		Key: f.str("key"), Temperament: f.str("temperament"), A4: f.num("a4"),
		Transpose: f.str("transpose"), Chord: f.str("chord"),
		Start: f.num("start_s"), End: f.num("end_s"), Note: f.note("note"), Hz: f.num("hz"),
		TargetHz: f.num("target_hz"), Cents: f.num("cents"), SamePitch: f.flag("same_pitch"), Spread: f.num("spread_cents"),
		VibratoWidth: f.num("vibrato_cents"), VibratoRate: f.num("vibrato_hz"),
	}
	if e.HasAlt = strings.TrimSpace(f.str("alt_note")) != ""; e.HasAlt {
		e.Alt, e.AltCents = f.note("alt_note"), f.num("alt_cents")
	}
	if _, e.OnOtherKnown = c.at["on_other_spelling"]; e.OnOtherKnown {
		e.OnOther = f.flag("on_other_spelling")
	}
	e.Voice, e.HeardChord, e.Member = f.later("voice"), f.later("heard_chord"), f.later("member")
	if e.HeardChord != "" {
		if e.Member == "" && f.err == nil {
			f.err = fmt.Errorf("heard_chord %q without its member", e.HeardChord)
		}
		if e.Reference = f.later("just_cents") == ""; !e.Reference {
			e.JustCents = f.num("just_cents")
		} else if e.Member != "root" && f.err == nil {
			f.err = fmt.Errorf("%s of %s without its just_cents", e.Member, e.HeardChord)
		}
	}
	if r := f.later("just_ratio"); r != "" {
		if e.HeardChord == "" || !isRatio(r) {
			if f.err == nil {
				f.err = fmt.Errorf("just_ratio %q: a ratio like 16/9, on a chord membership row", r)
			}
		} else {
			e.JustRatio = r
		}
	}
	if ch := f.later("channel"); ch != "" {
		if n, err := strconv.Atoi(ch); err == nil && n > 0 {
			e.Channel = n
		} else if f.err == nil {
			f.err = fmt.Errorf("channel %q is not a channel number", ch)
		}
	}
	e.Anchor = f.later("anchor")
	switch e.Anchor {
	case "":
		e.Anchor = target.AnchorA4.String()
		if e.Temperament == (target.Just{}).Spec() {
			e.Anchor = target.AnchorTonic.String()
		}
	case target.AnchorA4.String(), target.AnchorTonic.String():
	default:
		if f.err == nil {
			f.err = fmt.Errorf("anchor %q: a4 or tonic", e.Anchor)
		}
	}
	return e, f.err
}

// isRatio reports whether s is a ratio of two positive whole numbers, as
// just_ratio is written ("3/2", "16/9").
func isRatio(s string) bool {
	p, q, ok := strings.Cut(s, "/")
	n, perr := strconv.Atoi(p)
	d, qerr := strconv.Atoi(q)
	return ok && perr == nil && qerr == nil && n > 0 && d > 0
}

// later is a Later column's text, empty where the journal lacks it.
func (f *fieldReader) later(col string) string {
	if _, ok := f.c.at[col]; !ok {
		return ""
	}
	return strings.TrimSpace(f.str(col))
}

// notAHeader says what the first line is instead of the journal header. A
// recording or other binary file gets words, not its bytes quoted, since
// giving report the WAV instead of the journal is the likely slip.
func notAHeader(header string) error {
	switch {
	case strings.HasPrefix(header, "RIFF") || strings.HasPrefix(header, "RF64"):
		return errors.New("it is a WAV recording: read it with analyze, whose --log JOURNAL keeps its notes for report")
	case !utf8.ValidString(header) || strings.ContainsFunc(header, func(r rune) bool { return r < ' ' && r != '\t' }):
		return errors.New("its first line is not text, so not the journal header (a journal is the CSV that --log writes)")
	}
	return fmt.Errorf("its first line %.40q is not the journal header", header)
}
