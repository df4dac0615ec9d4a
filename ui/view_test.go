package ui

import (
	"math"
	"strings"
	"testing"

	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// quarterComma is C major in ¼-comma meantone at A4 = 415 Hz, the tuning the
// tests read tones in.
func quarterComma(t *testing.T) target.Tuning {
	t.Helper()
	tm, err := target.ParseTemperament("meantone:1/4")
	if err != nil {
		t.Fatal(err)
	}
	tu := target.Default()
	tu.Temperament, tu.A4 = tm, 415
	return tu
}

// Reference pitches in ¼-comma meantone, from its definition: every fifth
// is 5^(1/4) (four fifths make a pure 5/4 third two octaves up; published
// definition of quarter-comma meantone). F♯4 is three fifths above A4,
// G♭4 nine fifths below; they lie a lesser diesis, 128/125 = 41.06 ¢, apart
// (handbook value).
var (
	fifthQC = math.Pow(5, 0.25)
	fSharp4 = 415 * math.Pow(fifthQC, 3) / 4
	gFlat4  = 415 / math.Pow(fifthQC, 9) * 32
)

// holding is a model in which the note at hz has been held for a second.
func holding(tu target.Tuning, hz float64) *model {
	m := newModel(tu, "test tones")
	for i := range 100 {
		t := float64(i) * 0.01
		m.AddFrame(session.Frame{
			Estimate: pitchdetect.Estimate{Time: t, Hz: hz, Confidence: 1, Voiced: true, Level: -20},
			Holding:  true,
			Held:     pitchdetect.Held{Start: 0, End: t, Hz: hz, Spread: 0.5, VibratoWidth: 18, VibratoRate: 5.5},
		})
	}
	return m
}

func TestWordsNameTheNoteItsCentsAndTheOtherSpelling(t *testing.T) {
	qc := quarterComma(t)
	equal := target.Default()
	for _, c := range []struct {
		name string
		tu   target.Tuning
		hz   float64
		want string
	}{
		{"on the F♯ target", qc, fSharp4, "F♯4 is on its target · G♭4 would read −41.1 ¢"},
		{"a G♭ read in C major sits on G♭", qc, gFlat4, "F♯4 is 41.1 ¢ sharp ▲ · sits on G♭4 (0.0 ¢)"},
		// The quarter-gap rule (contract): 25 ¢ sharp of F♯4 in ¼-comma is
		// nearer G♭4 (16.1 ¢ away) but outside a quarter of the 41.1 ¢ gap
		// (10.3 ¢): "sharp, toward G♭4", never "on G♭4".
		{"nearer G♭ but not on it", qc, fSharp4 * math.Exp2(25.0/1200), "F♯4 is 25.0 ¢ sharp, toward G♭4 ▲"},
		// 10 ¢ below equal-tempered A4 = 440 Hz (ISO 16). A has no other
		// spelling (G𝄪 and B𝄫 carry two accidentals more; contract), and
		// in equal temperament the tuning line says once that spellings
		// share pitches.
		{"flat in equal temperament", equal, 440 * math.Exp2(-10.0/1200), "A4 is 10.0 ¢ flat ▼"},
		{"F♯ in equal temperament", equal, 370, "F♯4 is on its target"}, // 369.994 Hz (ISO 16)
	} {
		t.Run(c.name, func(t *testing.T) {
			if got := words(holding(c.tu, c.hz)).Text(); got != c.want {
				t.Errorf("got  %q\nwant %q", got, c.want)
			}
		})
	}
}

func TestBeforeAnyNoteTheMeterSaysItIsListening(t *testing.T) {
	m := newModel(target.Default(), "the demo performance")
	if got := words(m).Text(); !strings.Contains(got, "listening to the demo performance") {
		t.Errorf("Words = %q", got)
	}
	for _, l := range bigLines(m, 80, 1) {
		if strings.TrimSpace(l.Text()) != "" {
			t.Errorf("large glyphs before any note: %q", l.Text())
		}
	}
}

func TestFifthsRowsLayTheWindowAlongTheLineOfFifths(t *testing.T) {
	rows := fifthsRows(holding(quarterComma(t), gFlat4), 80)
	// C major's window (interface contract, "Spelling window").
	names := strings.Fields(rows[0].Text())
	want := []string{"◂", "[G♭4]", "E♭", "B♭", "F", "C", "G", "D", "A", "E", "B", "[F♯]", "C♯", "G♯"}
	if strings.Join(names, " ") != strings.Join(want, " ") {
		t.Errorf("names row %q, want fields %q", rows[0].Text(), want)
	}
	// G♭ lies below E♭ on the line, so it stands at the left end; the held
	// pitch is nearer it, so it is bracketed.
	if got := rows[0].Text(); !strings.HasPrefix(got, "◂ [G♭4]") {
		t.Errorf("the other spelling does not open the row: %q", got)
	}
	if got := strings.Fields(rows[1].Text()); strings.Join(got, " ") != "0.0 ¢ +41.1" {
		t.Errorf("marks row %q", rows[1].Text())
	}
	// ¼-comma meantone's offsets from equal: each fifth is 3.42 ¢ narrow, so
	// C (A4 fixed) sits 3 × 3.42 = +10.3 ¢ above equal and E♭ +20.5 (from
	// the definition: 21.506/4 per fifth, handbook syntonic comma).
	if got := strings.Fields(rows[2].Text()); got[2] != "+21" || got[5] != "+10" || got[8] != "0" {
		t.Errorf("from-equal row %q", rows[2].Text())
	}
}

// A minor key's row holds its raised fourth, sixth and seventh (contract,
// "Spelling window"; common meantone keyboard practice): G minor runs A♭ …
// C♯, and an in-tune C♯4 (third of the dominant's dominant) is lit there
// with no other spelling beside it to sit on.
func TestFifthsRowsOfAMinorKey(t *testing.T) {
	tu := quarterComma(t)
	tu.Key = target.Key{Tonic: target.Note{Letter: target.G, Octave: 4}, Mode: target.Minor}
	cs4 := target.Note{Letter: target.C, Accidental: 1, Octave: 4}
	rows := fifthsRows(holding(tu, tu.Target(cs4)), 80)
	want := "◂ D♭4 A♭ E♭ B♭ F C G D A E B F♯ [C♯]" // D♭ lies below A♭ on the line
	if got := strings.Join(strings.Fields(rows[0].Text()), " "); got != want {
		t.Errorf("names row %q, want fields %q", got, want)
	}
	if strings.Contains(rows[0].Text(), "[D♭4]") {
		t.Errorf("an in-tune C♯4 is shown on D♭: %q", rows[0].Text())
	}
}

func TestHeldLineGivesSpreadAndVibratoOnceANoteIsHeld(t *testing.T) {
	if got := heldLine(newModel(target.Default(), "x")).Text(); got != "" {
		t.Errorf("before a note: %q", got)
	}
	got := heldLine(holding(quarterComma(t), fSharp4)).Text()
	for _, want := range []string{"held 1.0 s", "spread 0.5 ¢", "vibrato 18 ¢ wide at 5.5 Hz"} {
		if !strings.Contains(got, want) {
			t.Errorf("%q lacks %q", got, want)
		}
	}
}

func TestInputLineWarnsOfClippingAndGapsInTheSoundInWords(t *testing.T) {
	m := holding(target.Default(), 440)
	m.Journal = "journal: 3 notes → rehearsal.csv"
	m.Input = inputState{Known: true, Clipping: true, Overflows: 2, Dropped: 1}
	got := inputLine(m).Text()
	// Blocks the driver lost and blocks dropped behind are one thing to a
	// player: gaps in what was heard, said only once there are some.
	for _, want := range []string{"input −20 dBFS ▮▮▮▮▮▮▮▯▯▯", "CLIPPING", "3 gaps in the sound (computer too busy)"} {
		if !strings.Contains(got, want) {
			t.Errorf("%q lacks %q", got, want)
		}
	}
	// A screen that fell behind says so in the same words: readings not
	// drawn (the notes and the journal have them).
	m.Dropped = 4
	if got := inputLine(m).Text(); !strings.Contains(got, "screen behind: 4 readings not drawn") {
		t.Errorf("%q does not say the screen fell behind", got)
	}
	m.Dropped = 0
	m.Input = inputState{Known: true}
	if got := inputLine(m).Text(); strings.Contains(got, "gap") || strings.Contains(got, "lost") {
		t.Errorf("nothing lost, yet the input line says %q", got)
	}
	if got := GapWords(1); got != "1 gap in the sound (computer too busy)" {
		t.Errorf("one gap: %q", got)
	}
	if got := journalLine(m).Text(); got != m.Journal {
		t.Errorf("journal line %q", got)
	}
	// Once the input has ended (the demo's performance), the line says so
	// in the shape of "input silent", without "no input: the input".
	m.Finished, m.Input = true, inputState{}
	if got := inputLine(m).Text(); got != "input ended ▯▯▯▯▯▯▯▯▯▯" {
		t.Errorf("ended input line %q", got)
	}
}

func TestTracePlacesCentsOnItsScale(t *testing.T) {
	// Held 20 ¢ sharp of equal-tempered A4 (ISO 16): with 4 rows there are 16
	// dot rows over 100 ¢ (6.25 ¢ each), so +20 ¢ is dot row 4, the top of
	// screen row 1.
	m := holding(target.Default(), 440*math.Exp2(20.0/1200))
	lines := trace(m, 80, 4)
	if len(lines) != 4 {
		t.Fatalf("%d lines", len(lines))
	}
	for y, l := range lines {
		hasDots := strings.ContainsFunc(l[1].Text, func(r rune) bool { return r > 0x2800 && r <= 0x28ff })
		if hasDots != (y == 1) {
			t.Errorf("row %d dots=%v: %q", y, hasDots, l.Text())
		}
	}
	if !strings.HasPrefix(lines[0].Text(), " +50 ┤") || !strings.HasSuffix(lines[0].Text(), "sharp") || !strings.HasSuffix(lines[3].Text(), "flat") {
		t.Errorf("scale labels: %q … %q", lines[0].Text(), lines[3].Text())
	}
}

func TestLayoutFillsAnyScreenAndKeepsTheEssentials(t *testing.T) {
	m := holding(quarterComma(t), gFlat4)
	for _, size := range [][2]int{{80, 24}, {120, 40}, {60, 16}, {40, 10}, {20, 5}, {1, 1}, {0, 0}} {
		w, h := size[0], size[1]
		lines := layout(m, w, h)
		if len(lines) != max(h, 0) {
			t.Errorf("%dx%d: %d lines", w, h, len(lines))
		}
		if w < 40 {
			continue
		}
		screen := ""
		for _, l := range lines {
			screen += l.Text() + "\n"
		}
		for _, want := range []string{"F♯4 is 41.1 ¢ sharp", "C major", "1/4-comma meantone", "A4 = 415.0 Hz", "journal: off"} {
			if !strings.Contains(screen, want) {
				t.Errorf("%dx%d lacks %q:\n%s", w, h, want, screen)
			}
		}
	}
	// At 80 × 24 everything is there: the large glyphs and the trace too.
	var screen strings.Builder
	for _, l := range layout(m, 80, 24) {
		if l.Width() > 80 {
			t.Errorf("line wider than 80: %q", l.Text())
		}
		screen.WriteString(l.Text() + "\n")
	}
	for _, want := range []string{big("F♯4 +41¢")[0], "from ET", " +50 ┤", "vibrato", "q quit"} {
		if !strings.Contains(screen.String(), strings.TrimRight(want, " ")) {
			t.Errorf("80x24 lacks %q:\n%s", want, screen.String())
		}
	}
}

func TestBigGlyphsAreOurBlockFont(t *testing.T) {
	for r, g := range font {
		for _, row := range g {
			if len(row) != len(g[0]) {
				t.Errorf("glyph %q rows differ in width", r)
			}
		}
	}
	rows := big("A4")
	if rows[0] != " ██  █  █" || bigWidth("A4") != 9 {
		t.Errorf("Big(A4) top row %q", rows[0])
	}
}

func TestCentsUseATrueMinusAndNeverMinusZero(t *testing.T) {
	for c, want := range map[float64]string{-3.25: "−3.2", 41.06: "+41.1", -0.04: "0.0", 0: "0.0"} {
		if got := cents(c); got != want {
			t.Errorf("Cents(%g) = %q, want %q", c, got, want)
		}
	}
}

func TestBigGlyphsDoubleWhenTheScreenIsLarge(t *testing.T) {
	m := holding(quarterComma(t), fSharp4)
	small, large := bigLines(m, 96, 1), bigLines(m, 96, 2)
	if len(small) != glyphRows || len(large) != 2*glyphRows {
		t.Fatalf("%d and %d rows", len(small), len(large))
	}
	var doubled strings.Builder
	for _, c := range strings.TrimSpace(small[0].Text()) {
		doubled.WriteString(string(c) + string(c))
	}
	if got := strings.TrimSpace(large[0].Text()); got != doubled.String() || large[1].Text() != large[0].Text() {
		t.Errorf("doubled top row %q, want %q", got, doubled.String())
	}
	// Too narrow for double: single size.
	if got := bigLines(m, 40, 2); len(got) != glyphRows {
		t.Errorf("40 columns: %d rows", len(got))
	}
}

func TestAKeysMessageGivesWayToTheHintAfterAFewSeconds(t *testing.T) {
	m := holding(target.Default(), 440)
	m.Say("key G major (1 sharp)")
	if got := hintLine(m).Text(); got != "key G major (1 sharp)" {
		t.Errorf("right after: %q", got)
	}
	m.AddFrame(session.Frame{Estimate: pitchdetect.Estimate{Time: m.Now + messageSeconds}})
	if got := hintLine(m).Text(); !strings.Contains(got, "q quit") {
		t.Errorf("later: %q", got)
	}
}

func TestTuningLineSaysKeyTemperamentA4AndTransposition(t *testing.T) {
	bb, err := target.ParseTransposition("Bb")
	if err != nil {
		t.Fatal(err)
	}
	qc := quarterComma(t)
	transposed := qc
	transposed.Transpose = bb
	for _, c := range []struct {
		tu   target.Tuning
		want string
	}{
		// Untransposed is "sounding pitch", the pair of written pitch
		// (common practice); "concert pitch" would read as a reference.
		{target.Default(), "C major · equal temperament · A4 = 440.0 Hz · F♯ = G♭ · sounding pitch"},
		{transposed, "C major · 1/4-comma meantone · A4 = 415.0 Hz · written for an instrument in B♭"},
	} {
		if got := tuningLine(newModel(c.tu, "x"), 96).Text(); got != c.want {
			t.Errorf("got  %q\nwant %q", got, c.want)
		}
	}
	// A B♭ instrument reads concert F♯4 as G♯4 (a major second up; common
	// practice), on the screen as in the CSV.
	m := holding(transposed, fSharp4)
	if got := words(m).Text(); !strings.HasPrefix(got, "G♯4 is on its target") {
		t.Errorf("transposed words %q", got)
	}
}

func TestAfterTheNoteEndsTheMeterShowsItAsTheLastNote(t *testing.T) {
	m := holding(quarterComma(t), fSharp4)
	// A one-frame gap (20 ms) inside the note is bridged.
	m.AddFrame(session.Frame{Estimate: pitchdetect.Estimate{Time: 1.01, Level: -90}})
	if got := words(m).Text(); !strings.HasPrefix(got, "F♯4 is on its target") {
		t.Errorf("during a one-frame gap: %q", got)
	}
	m.AddFrame(session.Frame{Estimate: pitchdetect.Estimate{Time: 1.1, Level: -90}})
	if got := words(m).Text(); !strings.HasPrefix(got, "last note: F♯4 is on its target") {
		t.Errorf("words %q", got)
	}
	if got := heldLine(m).Text(); !strings.HasPrefix(got, "last note held 1.0 s") {
		t.Errorf("held line %q", got)
	}
	if got := inputLine(m).Text(); !strings.HasPrefix(got, "input −90 dBFS ▯▯▯▯▯▯▯▯▯▯") {
		t.Errorf("input line %q", got)
	}
}

// The trace follows a retuning at once: the same held tone, 20 ¢ sharp of
// A4 = 440 Hz (ISO 16), sits on the 0 ¢ row once A4 is moved up 20 ¢.
func TestTraceFollowsANewTuning(t *testing.T) {
	hz := 440 * math.Exp2(20.0/1200)
	m := holding(target.Default(), hz)
	rowWithDots := func() int {
		for y, l := range trace(m, 80, 4) {
			if strings.ContainsFunc(l[1].Text, func(r rune) bool { return r > 0x2800 && r <= 0x28ff }) {
				return y
			}
		}
		return -1
	}
	if y := rowWithDots(); y != 1 {
		t.Fatalf("at A4 = 440 the dots are on row %d, want 1", y)
	}
	m.Tuning.A4 = hz
	if y := rowWithDots(); y != 2 {
		t.Errorf("at A4 = %.2f the dots are on row %d, want 2 (the 0 ¢ row)", hz, y)
	}
}

// The large glyphs carry whole cents; the tenths are on the words line
// (issue: a musician reads the big number from the stand, not its tenths).
func TestTheBigNumberIsInWholeCents(t *testing.T) {
	for _, c := range []struct {
		cents float64
		want  string
	}{{41.06, "+41"}, {-3.4, "−3"}, {0.4, "0"}, {-0.4, "0"}, {12.6, "+13"}} {
		if got := wholeCents(c.cents); got != c.want {
			t.Errorf("WholeCents(%v) = %q, want %q", c.cents, got, c.want)
		}
	}
	m := holding(quarterComma(t), fSharp4*math.Exp2(12.3/1200)) // F♯4 +12.3 ¢
	got := bigLines(m, 96, 1)[0].Text()
	if want := strings.TrimRight(big("F♯4 +12¢")[0], " "); !strings.Contains(got, want) {
		t.Errorf("big row %q lacks %q", got, want)
	}
}

// Digital silence is "silent", not a number like −300 dBFS, and an input
// that has ended says so.
func TestTheInputLineSaysSilentAndEndedInWords(t *testing.T) {
	m := newModel(target.Default(), "x")
	m.Level = -300 // 10·log10(1e-30): what the detector reports for zeros
	if got := inputLine(m).Text(); !strings.HasPrefix(got, "input silent") {
		t.Errorf("digital silence: %q", got)
	}
	m.Finished = true
	if got := inputLine(m).Text(); !strings.HasPrefix(got, "input ended") {
		t.Errorf("ended input: %q", got)
	}
}
