package main

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"fifthline/internal/testsignal"
	"fifthline/mts"
)

// Multitrack takes of our own four-part writing tempered through the MIDI
// Tuning Standard: each part's keys are tuned (real-time single-note
// changes, in the part's own tuning program, which its channel selects) to
// the pitches a published temperament gives its written notes, then
// rendered and mixed with bleed as the bent takes are (renderTake).
//
// The truth is each temperament's published definition, worked out here
// from its fifths and never from fifthline's own target package:
//   - ¼-comma meantone: every fifth narrowed by a quarter of the syntonic
//     comma 81/80, so four fifths make a pure 5/4 third: fifth =
//     1200·log2(5)/4 = 696.578 ¢ (Pietro Aron, 1523; common practice).
//   - Werckmeister III: the fifths C–G, G–D, D–A and B–F♯ narrowed by a
//     quarter of the Pythagorean comma (531441/524288, 23.460 ¢), the other
//     eight pure 3/2 (Andreas Werckmeister, Musicalische Temperatur, 1691).
//
// fluidsynth sounds each note a little away from its MIDI Tuning Standard
// pitch: the FluidR3 sample's own tuning, and fluidsynth's whole cents
// (TestFluidsynthTuningLandsOnWholeCents). So, as for the bent takes, each
// part rendered alone and read alone gives the instrument's own offset from
// the MIDI Tuning Standard pitch, and every check allows for it.

// Published sizes, in cents.
var (
	pureFifth       = 1200 * math.Log2(1.5)                           // 3/2: 701.955 ¢
	pureMajorThird  = 1200 * math.Log2(1.25)                          // 5/4: 386.314 ¢
	pureMinorThird  = 1200 * math.Log2(1.2)                           // 6/5: 315.641 ¢
	syntonicComma   = 1200 * math.Log2(81.0/80)                       // 21.506 ¢
	pythagComma     = 1200 * math.Log2(531441.0/524288)               // 23.460 ¢
	quarterComma    = pureFifth - syntonicComma/4                     // 696.578 ¢ = 1200·log2(5)/4
	werckmeisterIII = [12]float64{1, 1, 1, 0, 0, 1, 0, 0, 0, 0, 0, 0} // quarter commas off each fifth from C up
)

// temperament gives a written note's pitch class in cents above C from
// its place on the line of fifths (C = 0, G = 1, F = −1).
type temperament func(fifths int) float64

// regular is a temperament of one fifth size (meantone, EDOs).
func regular(fifth float64) temperament {
	return func(n int) float64 { return math.Mod(math.Mod(float64(n)*fifth, 1200)+1200, 1200) }
}

// werckmeister3 walks up the circle of fifths from C, each fifth pure or
// narrowed as the definition says; it closes on C because the four narrow
// fifths take out one Pythagorean comma. Enharmonic notes share a pitch.
func werckmeister3(n int) float64 {
	steps, c := (n%12+12)%12, 0.0
	for i := range steps {
		c += pureFifth - werckmeisterIII[i]*pythagComma/4
	}
	return math.Mod(c, 1200)
}

// writtenPitch is a written note ("Ab2", "F#4") in a temperament with A4 at
// a4 Hz: its key (MIDI 60 = C4, the octave number the letter's; common
// practice) and pitch, in the octave its key says.
func writtenPitch(t testing.TB, name string, tm temperament, a4 float64) (key int, hz float64) {
	t.Helper()
	letters := map[byte][2]int{'F': {-1, 5}, 'C': {0, 0}, 'G': {1, 7}, 'D': {2, 2}, 'A': {3, 9}, 'E': {4, 4}, 'B': {5, 11}}
	l, ok := letters[name[0]]
	if !ok || len(name) < 2 {
		t.Fatalf("written note %q", name)
	}
	acc := strings.Count(name, "#") - strings.Count(name, "b")
	octave := int(name[len(name)-1] - '0')
	key = 12*(octave+1) + l[1] + acc
	above := tm(l[0]+7*acc) - tm(3) // cents above A within an octave
	wrap := math.Round((float64(key-69)*100 - above) / 1200)
	return key, a4 * math.Exp2((above+1200*wrap)/1200)
}

// The temperaments as worked out here agree with their published tables
// (from memory: ¼-comma meantone's G♯ 772.6 ¢ and A♭ 813.7 ¢ above C, the
// diesis 41.1 ¢ between them, its pure thirds and fifths 5.38 ¢ narrow;
// Werckmeister III's C♯ 90.2, E 390.2, F♯ 588.3, A 888.3 and B♭ 996.1 ¢
// above C; 31-EDO's thirds of 10 and 8 steps, 387.1 and 309.7 ¢).
func TestPublishedTemperamentsAsWorkedOut(t *testing.T) {
	mt, w := regular(quarterComma), temperament(werckmeister3)
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"¼-comma fifth", quarterComma, 696.578},
		{"¼-comma major third (4 fifths less 2 octaves)", mt(4), pureMajorThird},
		{"¼-comma G♯", mt(8), 772.627},
		{"¼-comma A♭", mt(-4), 813.686},
		{"¼-comma diesis A♭ − G♯ (128/125)", mt(-4) - mt(8), 1200 * math.Log2(128.0/125)},
		{"Werckmeister III C♯", w(7), 90.225},
		{"Werckmeister III E", w(4), 390.225},
		{"Werckmeister III F♯", w(6), 588.270},
		{"Werckmeister III A", w(3), 888.270},
		{"Werckmeister III B♭ (= A♯)", w(-2), 996.090},
		{"Werckmeister III closes: B♯ = C", w(12), 0},
		{"¼-comma: major thirds from just", regularFromJust(quarterComma, "C major")["C major third"], 0},
		{"¼-comma: fifths from just", regularFromJust(quarterComma, "C major")["C major fifth"], -5.377},
		{"¼-comma: minor thirds from just", regularFromJust(quarterComma, "A minor")["A minor third"], -5.377},
		{"31-EDO major third (10 steps) from just", regularFromJust(edo31Fifth, "C major")["C major third"], 387.097 - 386.314},
		{"31-EDO minor third (8 steps) from just", regularFromJust(edo31Fifth, "A minor")["A minor third"], 309.677 - 315.641},
	} {
		if math.Abs(c.got-c.want) > 0.001 {
			t.Errorf("%s: %.3f ¢, published %.3f ¢", c.name, c.got, c.want)
		}
	}
	if _, hz := writtenPitch(t, "A4", regular(quarterComma), 415); hz != 415 {
		t.Errorf("A4 at 415 Hz sounds %.3f Hz", hz)
	}
	if _, hz := writtenPitch(t, "C4", temperament(werckmeister3), 440); math.Abs(hz-440*math.Exp2(-888.27/1200)) > 0.001 {
		t.Errorf("Werckmeister III C4 at A4 = 440 Hz: %.3f Hz", hz)
	}
}

// The MIDI Tuning Standard as fluidsynth plays it, measured: channels of
// one file, each selecting its own tuning program (registered parameter 3)
// that lays every key a given offset from equal temperament, and channels
// bent instead (no tuning), play A4 in turn on the square lead (General
// MIDI program 81, whose keys follow a tuning exactly;
// TestKeyboardTuningPlaysInFluidsynth). Each channel sounds its own
// program's tuning, and a fraction of a cent is dropped: fluidsynth turns a
// voice's pitch into hertz from whole cents (its sample's own tuning is
// whole cents too, as the SoundFont 2.01 generators are), so a key lands on
// the whole cent at or below its tuning, and a bend likewise.
func TestFluidsynthTuningLandsOnWholeCents(t *testing.T) {
	const squareLead, period = 80, 1.2
	cases := []struct {
		cents float64
		bend  bool // a pitch bend, else a tuning program
	}{
		{0, false}, {0.3, false}, {0.6, false}, {0.9, false}, {1.2, false}, {-0.3, false}, {30.5, false},
		{0.3, true}, {0.6, true}, {0.9, true}, {1.2, true}, {-0.3, true},
	}
	channel := func(i int) byte { return byte(i + i/9) } // not channel 10, General MIDI's drums
	var tr mts.Track
	for i, c := range cases {
		ch := channel(i)
		if c.bend {
			b := testsignal.BendValue(c.cents)
			tr.Channel(0, 0xE0|ch, byte(b&0x7f), byte(b>>7))
		} else {
			var keys mts.Keys
			for k := range keys {
				keys[k] = mts.FromHz(equalHz(k) * math.Exp2(c.cents/1200))
			}
			for _, m := range mts.SingleNoteChanges(mts.AllDevices, byte(i), &keys) {
				tr.SysEx(0, m)
			}
			tr.SelectChannelTuning(0, int(ch), 0, i)
		}
		tr.Channel(0, 0xC0|ch, squareLead)
	}
	wait := 0
	for i := range cases {
		tr.Channel(wait, 0x90|channel(i), 69, 96)
		tr.Channel(int(0.6*mts.TicksPerSecond), 0x80|channel(i), 69, 0)
		wait = int((period - 0.6) * mts.TicksPerSecond)
	}
	hz := renderAndMeasure(t, "programs", tr.File(mts.TicksPerSecond/2), len(cases), period)
	for i, c := range cases {
		moved, how := testsignal.Cents(hz[i], hz[0]), "tuning program"
		if c.bend {
			how = "bend"
		}
		t.Logf("channel %d, %s %+.1f ¢: moved %+.3f ¢", channel(i)+1, how, c.cents, moved)
		// A quarter cent either way for the measurement.
		if want := math.Floor(c.cents); math.Abs(moved-want) > 0.25 {
			t.Errorf("channel %d's %s of %+.1f ¢ moved A4 %+.2f ¢, not to the whole cent %+.0f ¢ below", channel(i)+1, how, c.cents, moved, want)
		}
	}
}

// temperedTake is a take of our own writing in a published temperament.
type temperedTake struct {
	name, key, temperament string // fifthline's --key and --temperament
	a4                     float64
	tm                     temperament // the published definition
	players                []string    // channel order, lowest part first
	programs               []int       // General MIDI, 0-based
	notes                  [][]writtenNote
	chords                 []string
	// fromJust is each chord member's published distance from just above
	// the root, in cents, by "chord member" (a temperament's property).
	fromJust map[string]float64
}

// writtenNote is a note as written, sounding from start for seconds.
type writtenNote struct {
	name           string
	start, seconds float64
}

// wn is a writtenNote.
func wn(name string, start, seconds float64) writtenNote { return writtenNote{name, start, seconds} }

// regularFromJust is a regular temperament's chords as its fifth makes
// them: a major third is four fifths less two octaves, a minor third a
// fifth less a major third; each member's distance from 5/4, 6/5 or 3/2 by
// "ROOT QUALITY member" for the chords given.
func regularFromJust(fifth float64, chords ...string) map[string]float64 {
	major := 4*fifth - 2400
	out := map[string]float64{}
	for _, c := range chords {
		out[c+" fifth"] = fifth - pureFifth
		if strings.HasSuffix(c, " minor") {
			out[c+" third"] = fifth - major - pureMinorThird
		} else {
			out[c+" third"] = major - pureMajorThird
		}
	}
	return out
}

// gMinorWinds is the meantone takes' writing: G minor at A4 = 415 Hz,
// i – ♭II – V – I with B♭, E♭, A♭ and F♯, B♮, each 41 ¢ (¼-comma) or 39 ¢
// (31-EDO: two steps) from its enharmonic, for bassoon, clarinet, oboe and
// flute. The flute's A4 enters on the bassoon's D3, its third harmonic,
// over the clarinet's D4 (pitchdetect's
// TestAHeldNoteIsNotMovedToTheSubharmonicOfABleed); the FluidR3 bassoon's
// G3 glides some 10 ¢ up into its vibrato (TestABassoonsAttackIsPartOfItsNote).
func gMinorWinds(name, temperament string, fifth float64) temperedTake {
	chords := []string{"G minor", "Ab major", "D major", "G major"}
	return temperedTake{
		name: name, key: "G minor", temperament: temperament, a4: 415, tm: regular(fifth),
		players: []string{"bn", "cl", "ob", "fl"}, programs: []int{70, 71, 68, 73},
		chords: chords,
		notes: [][]writtenNote{
			{wn("G3", 0, 1.4), wn("Ab3", 1.5, 1.4), wn("D3", 3, 1.4), wn("G3", 4.5, 1.4)},
			// D4 held from D major (its root) into G major (its fifth).
			{wn("D4", 0, 1.4), wn("Eb4", 1.5, 1.4), wn("D4", 3, 2.9)},
			{wn("Bb4", 0, 1.4), wn("C5", 1.5, 1.4), wn("F#4", 3, 1.4), wn("B4", 4.5, 1.4)},
			// The flute rests through the first two chords.
			{wn("A4", 3, 1.4), wn("G5", 4.5, 1.4)},
		},
		fromJust: regularFromJust(fifth, chords...),
	}
}

// edo31Fifth is 31-EDO's fifth, 18 of 31 equal steps to the octave
// (common practice).
const edo31Fifth = 1200.0 * 18 / 31

// temperedTakes: a wind quartet (General MIDI 70 bassoon or 57 trombone,
// 71 clarinet, 68 oboe, 73 flute) in each temperament; each take has a
// common tone held across a chord change and a player resting.
var temperedTakes = []temperedTake{
	gMinorWinds("meantone", "meantone:1/4", quarterComma),
	gMinorWinds("31-EDO", "edo:31", edo31Fifth),
	{
		// C major at A4 = 440 Hz: I – V/vi – vi. Werckmeister III's thirds
		// grow with the key's distance from C; from its table: C–E 390.2 ¢
		// (+3.9 from 5/4), E–G♯ 402.0 ¢ (+15.6, Pythagorean), A–C 311.7 ¢
		// (−3.9 from 6/5); C–G 696.1 ¢ (−5.9), E–B and A–E pure.
		name: "werckmeister3", key: "C major", temperament: "werckmeister3", a4: 440, tm: werckmeister3,
		players: []string{"bn", "cl", "ob", "fl"}, programs: []int{70, 71, 68, 73},
		chords: []string{"C major", "E major", "A minor"},
		notes: [][]writtenNote{
			{wn("C3", 0, 1.4), wn("E2", 1.5, 1.4), wn("A2", 3, 1.4)},
			// E4 held from C major (its third) into E major (its root).
			{wn("E4", 0, 2.9), wn("C4", 3, 1.4)},
			{wn("G4", 0, 1.4), wn("G#4", 1.5, 1.4), wn("A4", 3, 1.4)},
			// The flute rests through the C major chord.
			{wn("B4", 1.5, 1.4), wn("E5", 3, 1.4)},
		},
		fromJust: map[string]float64{
			"C major third": 3.911, "C major fifth": -5.865,
			"E major third": 15.641, "E major fifth": 0,
			"A minor third": -3.911, "A minor fifth": 0,
		},
	},
}

// ensemble makes the take's parts: each written note played on the key
// nearest its pitch (at A4 = 415 Hz mostly the key a semitone below its
// name's, as on a transposing keyboard), so that every sample sounds near
// its own pitch, and that key tuned to the note's pitch (the other keys
// left in equal temperament); one key may stand for one written note in a
// part. It returns each note's published pitch beside.
func (tt temperedTake) ensemble(t *testing.T) (ensembleTake, [][]float64) {
	t.Helper()
	take := ensembleTake{name: tt.name, key: tt.key, players: tt.players, chords: tt.chords, cents: 1,
		flags: []string{"--temperament", tt.temperament, "--a4", strconv.FormatFloat(tt.a4, 'f', -1, 64)}}
	pub := make([][]float64, len(tt.notes))
	for i, notes := range tt.notes {
		keys := new(mts.Keys)
		for k := range keys {
			keys[k] = mts.FromHz(equalHz(k))
		}
		part := testsignal.MIDIPart{Program: tt.programs[i], Tuning: keys}
		var written []string
		tuned := map[int]string{}
		for _, n := range notes {
			_, hz := writtenPitch(t, n.name, tt.tm, tt.a4)
			k := int(math.Round(69 + 12*math.Log2(hz/440)))
			if was, ok := tuned[k]; ok && was != n.name {
				t.Fatalf("%s %s: key %d written both %s and %s", tt.name, tt.players[i], k, was, n.name)
			}
			tuned[k], keys[k] = n.name, mts.FromHz(hz)
			part.Notes = append(part.Notes, testsignal.TimedNote{Key: k, Start: n.start, Seconds: n.seconds})
			written = append(written, n.name)
			pub[i] = append(pub[i], hz)
		}
		take.parts = append(take.parts, part)
		take.written = append(take.written, written)
	}
	return take, pub
}
