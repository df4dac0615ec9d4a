package main

import (
	"fmt"
	"math"
	"math/rand/v2"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"fifthline/internal/testsignal"
	"fifthline/pitchdetect"
)

// Multitrack takes of our own four-part writing, each part rendered alone
// by Debian's fluidsynth from the FluidR3 soundfont (fluid-soundfont-gm;
// reverb and chorus off) onto its own channel, then mixed with what close
// microphones hear of their neighbours: 15–25 dB down and 1–6 ms late,
// different for every pair (the ensemble issue's figures).
//
// Detunings are MIDI pitch bends, per part for the whole take and per note
// where a chord is written just: MIDI 1.0's 14-bit bend over the default
// ±2 semitones (common practice), to 0.0122 ¢. A just third lies 13.69 ¢
// below equal temperament's, a just fifth 1.96 ¢ above (386.31 and
// 701.96 ¢ from 5/4 and 3/2).
//
// FluidR3's samples carry their own tuning (set by ear) and, for strings
// and voices, their own vibrato, so the truth of each note is what the
// same part reads alone, without bleed; the chords' truth is the same
// multitrack read without bleed. (tempered_takes_test.go has takes tuned
// through the MIDI Tuning Standard instead.)

// ensembleTake is one take's writing.
type ensembleTake struct {
	name, key string
	players   []string              // channel order, lowest part first
	parts     []testsignal.MIDIPart // one per player
	chords    []string              // the chords written, in order
	cents     float64               // how far a note may read from its lone part's reading
	flags     []string              // musical flags beyond the key (temperament, A4)
	written   [][]string            // each part's notes as spelled, where spelledInC would not
	// chordCents is how far a third or fifth may read from its reading
	// without bleed; 0 is the ensemble issue's 1.5 ¢.
	chordCents float64
	// bleedSeed, when not 0, draws the take's bleed at random (seeded)
	// instead of bleedDB and bleedMs (bleed).
	bleedSeed uint64
}

// musical is the take's musical flags for fifthline.
func (e ensembleTake) musical() []string { return append([]string{"--key", e.key}, e.flags...) }

// spelled is part i's note j as written.
func (e ensembleTake) spelled(i, j int) string {
	if e.written != nil {
		return e.written[i][j]
	}
	return spelledInC(e.parts[i].Notes[j].Key)
}

// justThird and justFifth are the bends that make a third or fifth just
// above an equal-tempered root.
const (
	justThird = -13.69
	justFifth = 1.96
)

// note is a TimedNote of the takes, bent by cents beyond its part.
func note(key int, start, seconds, cents float64) testsignal.TimedNote {
	return testsignal.TimedNote{Key: key, Start: start, Seconds: seconds, Cents: cents}
}

// ensembleTakes: a wind quartet, a string quartet and a choir, three
// chords each of 1.4 s. Each has a common tone held across a chord change,
// a player resting for a chord and a last chord written just (third and
// fifth bent from the root's pitch; the part's own bend taken back).
// General MIDI programs, 0-based: 70 bassoon, 71 clarinet, 68 oboe,
// 73 flute, 42 cello, 41 viola, 40 violin, 53 voice oohs (FluidR3's
// choir aahs is a chorus of voices whose pitch reads 10–40 ¢ apart note
// to note even alone).
var ensembleTakes = []ensembleTake{
	{
		name: "winds", key: "C major", players: []string{"bn", "cl", "ob", "fl"}, cents: 1,
		chords: []string{"C major", "A minor", "F major"},
		parts: []testsignal.MIDIPart{
			{Program: 70, Cents: 0, Notes: []testsignal.TimedNote{note(48, 0, 1.4, 0), note(45, 1.5, 1.4, 0), note(53, 3, 1.4, 0)}},
			// E4 held from C major (its third) into A minor (its fifth).
			{Program: 71, Cents: 3, Notes: []testsignal.TimedNote{note(64, 0, 2.9, 0), note(60, 3, 1.4, justFifth-3)}},
			{Program: 68, Cents: -4, Notes: []testsignal.TimedNote{note(67, 0, 1.4, 0), note(72, 1.5, 1.4, 0), note(69, 3, 1.4, justThird+4)}},
			// The flute rests through the first chord.
			{Program: 73, Cents: 2, Notes: []testsignal.TimedNote{note(81, 1.5, 1.4, 0), note(77, 3, 1.4, -2)}},
		},
	},
	{
		name: "strings", key: "D major", players: []string{"vc", "vla", "vl2", "vl1"}, cents: 1.5,
		chords: []string{"D major", "A major", "G major"},
		parts: []testsignal.MIDIPart{
			{Program: 42, Cents: 0, Notes: []testsignal.TimedNote{note(50, 0, 1.4, 0), note(45, 1.5, 1.4, 0), note(43, 3, 1.4, 0)}},
			// A3 held from D major (its fifth) into A major (its root).
			{Program: 41, Cents: -3, Notes: []testsignal.TimedNote{note(57, 0, 2.9, 0), note(59, 3, 1.4, justThird+3)}},
			{Program: 40, Cents: 4, Notes: []testsignal.TimedNote{note(66, 0, 1.4, 0), note(61, 1.5, 1.4, 0), note(62, 3, 1.4, justFifth-4)}},
			// The first violin rests through the last chord.
			{Program: 40, Cents: -2, Notes: []testsignal.TimedNote{note(74, 0, 1.4, 0), note(76, 1.5, 1.4, 0)}},
		},
	},
	{
		name: "choir", key: "F major", players: []string{"b", "t", "a", "s"}, cents: 1.5,
		chords: []string{"F major", "Bb major", "C major"},
		parts: []testsignal.MIDIPart{
			{Program: 53, Cents: 2, Notes: []testsignal.TimedNote{note(41, 0, 1.4, 0), note(46, 1.5, 1.4, 0), note(48, 3, 1.4, 0)}},
			{Program: 53, Cents: -3, Notes: []testsignal.TimedNote{note(60, 0, 1.4, 0), note(62, 1.5, 1.4, 0), note(64, 3, 1.4, justThird+5)}},
			// F4 held from F major (its root) into B♭ major (its fifth).
			{Program: 53, Cents: 1, Notes: []testsignal.TimedNote{note(65, 0, 2.9, 0), note(67, 3, 1.4, justFifth+1)}},
			// The sopranos rest through the middle chord.
			{Program: 53, Cents: -4, Notes: []testsignal.TimedNote{note(69, 0, 1.4, 0), note(72, 3, 1.4, 6)}},
		},
	},
}

// bleedDB[c][o] is how far below player o's own level channel c hears
// them, and bleedMs[c][o] how late.
var (
	bleedDB = [4][4]float64{{0, 18, 22, 25}, {17, 0, 16, 21}, {21, 15, 0, 19}, {24, 20, 16, 0}}
	bleedMs = [4][4]float64{{0, 1.4, 3.1, 5.6}, {1.2, 0, 2.3, 4.1}, {3.4, 2.1, 0, 1.7}, {5.8, 3.9, 1.6, 0}}
)

// bleed is how far below each player's level, dB, and how late, ms,
// channel c hears player o: bleedDB and bleedMs, or with a bleedSeed drawn
// evenly from the ensemble issue's 15–25 dB and 1–6 ms, every pair its own.
func (e ensembleTake) bleed() (db, ms [4][4]float64) {
	if e.bleedSeed == 0 {
		return bleedDB, bleedMs
	}
	rng := rand.New(rand.NewPCG(e.bleedSeed, 13))
	for c := range db {
		for o := range db[c] {
			if o != c {
				db[c][o], ms[c][o] = 15+10*rng.Float64(), 1+5*rng.Float64()
			}
		}
	}
	return db, ms
}

// renderedTake is a take on disk: the multitrack with bleed, the same
// without, and each part alone (mono).
type renderedTake struct {
	ensembleTake
	wet, dry string
	lone     []string
	frames   map[int][]map[string]string // each part alone, frame by frame, once read
	held     map[int][]pitchdetect.Held  // each part's notes alone, once read
}

// renderTake renders each part alone (fluidsynth), pads it with leadIn
// seconds of silence and makes it mono (sox), then mixes the multitracks
// with and without bleed (mix).
func renderTake(t *testing.T, take ensembleTake) renderedTake {
	t.Helper()
	// The files are shared by the tests that read the same take
	// (sharedOnce; a part's tuning counts by its address, so the same
	// written take); the frames read from them are each test's own.
	r := sharedOnce(t, fmt.Sprintf("ensemble take %#v", take), func(dir string) renderedTake { return renderTakeIn(t, dir, take) })
	r.frames, r.held = map[int][]map[string]string{}, map[int][]pitchdetect.Held{}
	return r
}

// forEachTake renders each take and checks it in a subtest named by the
// take.
func forEachTake(t *testing.T, takes []ensembleTake, check func(*testing.T, renderedTake)) {
	t.Helper()
	for _, take := range takes {
		t.Run(take.name, func(t *testing.T) { check(t, renderTake(t, take)) })
	}
}

func renderTakeIn(t *testing.T, dir string, take ensembleTake) renderedTake {
	r := renderedTake{ensembleTake: take}
	for i, p := range take.parts {
		name := filepath.Join(dir, take.players[i])
		raw := fluidWAV(t, testsignal.MIDIParts([]testsignal.MIDIPart{p}), "-ni", "-q", "-R", "0", "-C", "0", "-g", "0.5", "-r", "48000")
		soxTB(t, raw, "-b", "24", "-c", "1", name+".wav", "pad", strconv.FormatFloat(leadIn, 'f', 4, 64), "0.3")
		r.lone = append(r.lone, name+".wav")
	}
	r.mix(t, dir, nil)
	return r
}

// mix writes the multitracks of the lone parts into dir (sox): channel c
// of the wet take is part c plus every other part o, bleedDB[c][o] down
// and bleedMs[c][o] late (or as the take's bleedSeed draws), plus noise[c] when noise is given (raw 32-bit
// float files at 48 kHz, one per channel); the dry take is the parts alone.
func (r *renderedTake) mix(t *testing.T, dir string, noise []string) {
	t.Helper()
	r.wet, r.dry = filepath.Join(dir, "wet.wav"), filepath.Join(dir, "dry.wav")
	wet := append([]string{"-M"}, r.lone...)
	inputs := len(r.lone) // sox -M numbers the merged inputs' channels from 1
	add := func(file ...string) string {
		wet = append(wet, file...)
		inputs++
		return strconv.Itoa(inputs)
	}
	db, ms := r.bleed()
	var remix []string
	for c := range r.lone {
		mix := []string{strconv.Itoa(c + 1)}
		for o := range r.lone {
			if o == c {
				continue
			}
			late := filepath.Join(dir, "late"+strconv.Itoa(c)+strconv.Itoa(o)+".wav")
			soxTB(t, r.lone[o], late, "pad", strconv.FormatFloat(ms[c][o]/1000, 'f', 6, 64)) // to the microsecond
			mix = append(mix, add(late)+"v"+strconv.FormatFloat(math.Pow(10, -db[c][o]/20), 'f', 6, 64))
		}
		if noise != nil {
			mix = append(mix, add("-t", "raw", "-e", "floating-point", "-b", "32", "-r", "48000", "-c", "1", noise[c])+"v1")
		}
		remix = append(remix, strings.Join(mix, ","))
	}
	soxTB(t, append(append(wet, "-b", "24", r.wet, "remix"), remix...)...)
	soxTB(t, append(append([]string{"-M"}, r.lone...), "-b", "24", r.dry)...)
}

// loneNotes reads each part alone, one channel at a time, with the
// single-player analysis: each note's truth. It fails the test if a lone
// part is not heard as written (then the render, not the ensemble
// reading, is at fault).
func (r renderedTake) loneNotes(t *testing.T) [][]map[string]string {
	t.Helper()
	var all [][]map[string]string
	for i, path := range r.lone {
		code, out, stderr := runLong(t, append(append([]string{"analyze"}, r.musical()...), path)...)
		if code != 0 {
			t.Fatalf("%s %s alone: exit %d: %s", r.name, r.players[i], code, stderr)
		}
		_, rows := readCSV(t, out)
		if len(rows) != len(r.parts[i].Notes) {
			t.Fatalf("%s %s alone: %d notes, %d written:\n%s", r.name, r.players[i], len(rows), len(r.parts[i].Notes), out)
		}
		for j, row := range rows {
			// Every note the bent takes write is spelled alike in C, D
			// and F major (C♯, F♯ and B♭ included), as spelledInC spells
			// it; the tempered takes say how each is written.
			if want := r.spelled(i, j); row["note"] != want {
				t.Fatalf("%s %s alone: note %d read %s, written %s", r.name, r.players[i], j+1, row["note"], want)
			}
			// The sample's own tuning, as the lone part reads it.
			t.Logf("%s %s %s: alone %s Hz, %+.2f ¢ from the asked %.3f Hz", r.name, r.players[i], row["note"], row["hz"], testsignal.Cents(parseF(row["hz"]), r.asked(i, j)), r.asked(i, j))
		}
		all = append(all, rows)
	}
	return all
}

// asked is the pitch the render of part i's note j was asked for: its key
// where the part's MIDI Tuning Standard tuning puts it, else in equal
// temperament at A4 = 440 Hz (ISO 16), bent as written.
func (r renderedTake) asked(i, j int) float64 {
	n := r.parts[i].Notes[j]
	if tu := r.parts[i].Tuning; tu != nil {
		return tu[n.Key].Hz()
	}
	return 440 * math.Exp2((float64(n.Key-69)+testsignal.BendCents(r.parts[i].Cents+n.Cents)/100)/12)
}
