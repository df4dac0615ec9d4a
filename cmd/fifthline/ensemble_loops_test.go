package main

import (
	"encoding/binary"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"fifthline/internal/sf2"
	"fifthline/internal/testsignal"
)

// The same four-part writing as the rendered takes (ensembleTakes), played
// by additive voices whose harmonic profiles are measured from FluidR3's
// sample loops (sf2.Timbre; Debian fluid-soundfont-gm): each note's
// instantaneous fundamental is exactly the pitch written (equal
// temperament at A4 = 440 Hz, ISO 16, bent as the MIDI parts bend), so the
// truth is exact, where a fluidsynth render's is the part read alone.
// Steady, or with vibrato (its truth the centre: the log-frequency mean
// over whole cycles, common practice); notes start and end with
// raised-cosine ramps (40 ms attack, 80 ms release); bleed as the rendered
// takes (mix); white noise on each channel at the take's SNR against that
// channel's own part. The bar: every note spelled and within 1 ¢
// (1.5 ¢ with vibrato), resting players silent, every chord named, every
// third and fifth within 1.5 ¢ of its exact just deviation.

// loopInstrument is the FluidR3 instrument (its loops' profiles) that
// plays a General MIDI program of the takes.
var loopInstrument = map[int]string{70: "Bassoon", 71: "Clarinet", 68: "Oboe", 73: "Flute",
	42: "Cello", 41: "Viola", 40: "Violin", 53: "Ohh Voices"}

// loopTake is a take of ensembleTakes played by loop voices.
type loopTake struct {
	take    int
	vibrato float64 // peak-to-peak cents, 0 for steady
	snr     float64 // dB
}

// Vibrato widths: bowed strings and voices some ±15–25 ¢ at 5–6 Hz
// (common practice); every player at a rate of their own, so no two
// players' vibratos keep in step.
var loopTakes = []loopTake{{0, 0, 40}, {0, 30, 45}, {1, 0, 35}, {1, 40, 40}, {2, 0, 45}, {2, 40, 35}}

const loopRate = 48000.0

// playLoopTake writes each part of lt's take (steady or with vibrato) as
// its channel's lone part, white noise for each channel, and mixes them.
func playLoopTake(t *testing.T, lt loopTake, timbres map[string][]sf2.Timbre) renderedTake {
	t.Helper()
	dir := t.TempDir()
	r := renderedTake{ensembleTake: ensembleTakes[lt.take]}
	r.cents = 1
	if lt.vibrato > 0 {
		r.cents = 1.5
	}
	end := 0.0
	for _, p := range r.parts {
		for _, n := range p.Notes {
			end = max(end, n.Start+n.Seconds)
		}
	}
	total := int((leadIn + end + 0.3) * loopRate)
	rng := rand.New(rand.NewPCG(uint64(lt.take), uint64(lt.snr)))
	var noise []string
	for i, p := range r.parts {
		x := make([]float64, total)
		for j, n := range p.Notes {
			hz := r.asked(i, j)
			tb, ok := sf2.Nearest(timbres[loopInstrument[p.Program]], hz)
			if !ok {
				t.Fatalf("no FluidR3 profile of %s", loopInstrument[p.Program])
			}
			track := testsignal.Steady(hz)
			if lt.vibrato > 0 {
				track = testsignal.Vibrato(hz, lt.vibrato, 5.1+0.4*float64(i))
			}
			y := tb.Play(loopRate, int(n.Seconds*loopRate), 0.2, track, 0.04, 0.08)
			at := int((leadIn + n.Start) * loopRate)
			for k, v := range y {
				x[at+k] += v
			}
		}
		name := filepath.Join(dir, r.players[i])
		r.lone = append(r.lone, monoWAV(t, name, x))
		w := testsignal.White(rng, total)
		g := testsignal.RMS(x) / testsignal.RMS(w) / math.Pow(10, lt.snr/20)
		for k := range w {
			w[k] *= g
		}
		writeF32(t, name+".noise.f32", w)
		noise = append(noise, name+".noise.f32")
	}
	r.mix(t, dir, noise)
	if lt.vibrato > 0 {
		r.name += " with vibrato"
	}
	for i, p := range r.parts {
		for j, n := range p.Notes {
			t.Logf("%s %s %s: %.4f Hz written", r.name, r.players[i], spelledInC(n.Key), r.asked(i, j))
		}
	}
	return r
}

// writeF32 writes raw little-endian 32-bit floats, as sox reads them with
// -t raw -e floating-point -b 32.
func writeF32(t *testing.T, path string, x []float64) {
	t.Helper()
	b := make([]byte, 4*len(x))
	for i, v := range x {
		binary.LittleEndian.PutUint32(b[4*i:], math.Float32bits(float32(v)))
	}
	if err := os.WriteFile(path, b, 0o644); err != nil {
		t.Fatal(err)
	}
}

// monoWAV writes x as name.wav, 24-bit at 48 kHz (sox, from name.f32).
func monoWAV(t *testing.T, name string, x []float64) string {
	t.Helper()
	writeF32(t, name+".f32", x)
	soxTB(t, "-t", "raw", "-e", "floating-point", "-b", "32", "-r", "48000", "-c", "1", name+".f32", "-b", "24", name+".wav")
	return name + ".wav"
}

// loopTimbres are FluidR3's profiles of the instruments the takes use.
func loopTimbres(t *testing.T) map[string][]sf2.Timbre {
	t.Helper()
	_, path := fluidSynth(t)
	font := sf2.OpenForTest(t, path)
	var names []string
	for _, n := range loopInstrument {
		names = append(names, n)
	}
	all, err := font.Timbres(names, 20000)
	if err != nil {
		t.Fatal(err)
	}
	by := map[string][]sf2.Timbre{}
	for _, tb := range all {
		by[tb.Instrument] = append(by[tb.Instrument], tb)
	}
	return by
}

// exactNotes are the take's notes as the lone parts' rows would give them
// were they read without error: spelled, at the written pitch, from the
// written start.
func (r renderedTake) exactNotes() [][]map[string]string {
	var all [][]map[string]string
	for i, p := range r.parts {
		var rows []map[string]string
		for j, n := range p.Notes {
			rows = append(rows, map[string]string{"note": spelledInC(n.Key),
				"hz": strconv.FormatFloat(r.asked(i, j), 'f', 6, 64), "start_s": strconv.FormatFloat(leadIn+n.Start, 'f', 3, 64)})
		}
		all = append(all, rows)
	}
	return all
}

// exactJust is how far a chord member lies from just above the chord's
// lowest sounding root, from the written pitches (the contract's
// just_cents with every pitch exact), and the member's written pitch.
func (r renderedTake) exactJust(chord chordRow, player string) (just, hz float64) {
	return justAbove(chord, player, func(p string) float64 {
		i := slices.Index(r.players, p)
		m := chord.members[p]
		mid := (parseF(m["start_s"]) + parseF(m["end_s"])) / 2
		for j, n := range r.parts[i].Notes {
			if mid >= leadIn+n.Start && mid <= leadIn+n.Start+n.Seconds {
				return r.asked(i, j)
			}
		}
		return math.NaN()
	})
}

// justAbove is how far a chord member lies from just above the chord's
// lowest sounding root (5/4, 6/5 or 3/2 and octaves), with each player's
// pitch as at gives it, and the member's pitch.
func justAbove(chord chordRow, player string, at func(player string) float64) (just, hz float64) {
	root := math.Inf(1)
	for p, m := range chord.members {
		if m["member"] == "root" {
			root = min(root, at(p))
		}
	}
	q := map[string]float64{"root": 1, "fifth": 1.5, "third": 1.25}[chord.members[player]["member"]]
	if strings.HasSuffix(chord.name, " minor") && q == 1.25 {
		q = 1.2
	}
	hz = at(player)
	k := math.Round(math.Log2(hz / (root * q)))
	return testsignal.Cents(hz, root*q*math.Exp2(k)), hz
}

// analyze --players and --chords on the loop voices' takes, against exact
// truth: the bar, with the measured worst and median logged.
func TestAnalyzePlayersReadsLoopVoicesExactly(t *testing.T) {
	t.Parallel()
	timbres := loopTimbres(t)
	var notes, justs []float64
	for _, lt := range loopTakes {
		name := ensembleTakes[lt.take].name
		if lt.vibrato > 0 {
			name += " with vibrato"
		}
		t.Run(name, func(t *testing.T) {
			r := playLoopTake(t, lt, timbres)
			code, out, stderr := runLong(t, "analyze", "--key", r.key, "--players", strings.Join(r.players, ","), r.wet)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, stderr)
			}
			_, rows := readCSV(t, out)
			exact := r.exactNotes()
			offs := checkPlayerNotes(t, "analyze", r, exact, rows, true)
			for _, row := range rows {
				i := slices.Index(r.players, row["player"])
				for _, e := range exact[max(i, 0)] {
					if e["note"] == row["note"] && math.Abs(parseF(e["start_s"])-parseF(row["start_s"])) < 0.1 {
						t.Logf("%s %s %s: %s Hz, %+.3f ¢ from written", r.name, row["player"], row["note"], row["hz"], testsignal.Cents(parseF(row["hz"]), parseF(e["hz"])))
					}
				}
			}
			chords := readChords(t, r, r.wet)
			var names []string
			for _, c := range chords {
				names = append(names, strings.SplitN(c.name, " ", 2)[1])
			}
			if strings.Join(names, ", ") != strings.Join(r.chords, ", ") {
				t.Errorf("chords %s, written %s", strings.Join(names, ", "), strings.Join(r.chords, ", "))
			}
			var js []float64
			for _, c := range chords {
				for p, m := range c.members {
					want, hz := r.exactJust(c, p)
					if m["member"] != "third" && m["member"] != "fifth" {
						continue
					}
					off := parseF(m["just_cents"]) - want
					js = append(js, off)
					if math.IsNaN(off) || math.Abs(off) > 1.5 {
						t.Errorf("%s: %s's %s %s (%.3f Hz written) %+.2f ¢ from just; exactly %+.2f ¢", c.name, p, m["member"], m["note"], hz, parseF(m["just_cents"]), want)
					}
				}
			}
			t.Logf("%s: notes worst %.3f median %.3f ¢; thirds and fifths' just readings worst %.3f median %.3f ¢ from exact",
				r.name, worstAbs(offs), medianAbs(offs), worstAbs(js), medianAbs(js))
			notes, justs = append(notes, offs...), append(justs, js...)
		})
	}
	t.Logf("all takes: %d notes, worst %.3f ¢, median %.3f ¢; %d thirds and fifths, worst %.3f ¢, median %.3f ¢ from exact just",
		len(notes), worstAbs(notes), medianAbs(notes), len(justs), worstAbs(justs), medianAbs(justs))
}

func worstAbs(x []float64) float64 {
	w := 0.0
	for _, v := range x {
		w = max(w, math.Abs(v))
	}
	return w
}

func medianAbs(x []float64) float64 {
	if len(x) == 0 {
		return 0
	}
	a := make([]float64, len(x))
	for i, v := range x {
		a[i] = math.Abs(v)
	}
	slices.Sort(a)
	return a[len(a)/2]
}
