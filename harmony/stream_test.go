package harmony

import (
	"cmp"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"fifthline/target"
)

// Chords found as notes end are the chords found from all the notes at
// once: the same stretches, members and pitches, though the stream keeps
// only what its open chords need. Three players wander over the notes of
// C major's triad in equal temperament at A4 = 440 Hz (ISO 16;
// 440·2^(n/12)), each a little off, entering and leaving at random (our own
// scenario); each note is given as it ends, with the earliest start still
// to come as the horizon, as a live reading gives them.
func TestStreamGivesTheChordsFindGives(t *testing.T) { streamGivesWhatFindGives(t, false) }

// So do the chords of voices heard on one channel, whose pieces of a chord
// (fragment.go) are left out: the same scenario read as voices.
func TestStreamGivesTheChordsFindOneChannelGives(t *testing.T) { streamGivesWhatFindGives(t, true) }

// streamGivesWhatFindGives plays the scenario above through a Stream,
// with oneChannel as FindOneChannel reads it.
func streamGivesWhatFindGives(t *testing.T, oneChannel bool) {
	tu := target.Default()
	parse := func(s string) target.Note { n, _ := target.ParseNote(s); return n }
	pool := []string{"C3", "E3", "G3", "C4", "E4", "G4", "A3", "F3"}
	rng := rand.New(rand.NewPCG(13, 1))
	var notes []Note
	tracks := make([]Track, 3)
	whole := make([]Track, 3) // the same frames, never forgotten, for Find
	who := []string{"vc", "vla", "vl"}
	for p := range 3 {
		at := rng.Float64()
		for at < 60 {
			n := parse(pool[rng.IntN(len(pool))])
			hz := tu.Target(n) * math.Exp2((rng.Float64()*10-5)/1200)
			length := 0.2 + 2*rng.Float64()
			for f := at; f <= at+length; f += 0.01 {
				tracks[p].Add(f, hz*math.Exp2(math.Sin(f*30)*3/1200))
				whole[p].Add(f, hz*math.Exp2(math.Sin(f*30)*3/1200))
			}
			notes = append(notes, Note{Start: at, End: at + length, Who: who[p], Note: n, Hz: hz, Frames: &whole[p]})
			at += length + 0.5*rng.Float64()*float64(rng.IntN(2))
		}
	}
	want := find(notes, tu, target.DefaultSeventh, oneChannel)
	if pieces := len(Find(notes, tu, target.DefaultSeventh)) - len(want); oneChannel && pieces < 3 {
		t.Fatalf("%d pieces of chords in the scenario; it asks for some", pieces)
	}
	if len(want) < 20 {
		t.Fatalf("only %d chords in the scenario", len(want))
	}
	byEnd := slices.Clone(notes)
	slices.SortFunc(byEnd, func(a, b Note) int { return cmp.Compare(a.End, b.End) })
	s := Stream{Seventh: target.DefaultSeventh, OneChannel: oneChannel}
	var got []Chord
	var members [][]string
	take := func(cs []Chord, ns []Note) {
		for _, c := range cs {
			var m []string
			for _, k := range c.Notes {
				m = append(m, ns[k].Who)
			}
			got, members = append(got, c), append(members, m)
		}
	}
	most := 0
	for i, n := range byEnd {
		n.Frames = &tracks[slices.Index(who, n.Who)]
		s.Add(n)
		horizon := math.Inf(1)
		for _, later := range byEnd[i+1:] {
			horizon = min(horizon, later.Start)
		}
		take(s.Ready(min(horizon, n.End), func(float64) target.Tuning { return tu }))
		for p := range tracks {
			tracks[p].Forget(s.From())
		}
		most = max(most, len(s.notes))
	}
	take(s.Ready(math.Inf(1), func(float64) target.Tuning { return tu }))
	if len(got) != len(want) {
		t.Fatalf("%d chords as the notes end, %d from all at once", len(got), len(want))
	}
	for i, w := range want {
		g := got[i]
		if g.Start != w.Start || g.End != w.End || g.Name() != w.Name() {
			t.Errorf("chord %d: %s %.3f–%.3f s, want %s %.3f–%.3f s", i, g.Name(), g.Start, g.End, w.Name(), w.Start, w.End)
			continue
		}
		for j, m := range w.Members {
			if g.Members[j].Hz != m.Hz || members[i][j] != notes[w.Notes[j]].Who {
				t.Errorf("chord %d member %d: %s at %.4f Hz, want %s at %.4f Hz", i, j, members[i][j], g.Members[j].Hz, notes[w.Notes[j]].Who, m.Hz)
			}
		}
	}
	t.Logf("kept at most %d of %d notes", most, len(notes))
	if most > 12 {
		t.Errorf("the stream kept up to %d of the %d notes; it needs only those of open chords", most, len(notes))
	}
}

// Each chord is named in the tuning in force at its end, however late it
// is given: a key changed after a chord does not re-read it (the readings
// themselves are checked against published temperaments in
// cmd/fifthline's TestGroupMeterChordsKeepTheirTuning). Pitches in equal
// temperament at A4 = 440 Hz (ISO 16).
func TestStreamNamesEachChordInItsOwnTuning(t *testing.T) {
	tu := target.Default()
	parse := func(s string) target.Note { n, _ := target.ParseNote(s); return n }
	var s Stream
	s.Seventh = target.DefaultSeventh
	for _, at := range []float64{0, 2} {
		s.Add(Note{Start: at, End: at + 1, Who: "vc", Note: parse("C3"), Hz: tu.Target(parse("C3"))})
		s.Add(Note{Start: at, End: at + 1, Who: "vl", Note: parse("E4"), Hz: tu.Target(parse("E4"))})
	}
	var asked []float64
	got, _ := s.Ready(math.Inf(1), func(at float64) target.Tuning { asked = append(asked, at); return tu })
	if len(got) != 2 || !slices.Equal(asked, []float64{1, 3}) {
		t.Errorf("%d chords, tunings asked at %v s; want 2, asked at their ends 1 and 3 s", len(got), asked)
	}
}

// A pedal: the bass holds C2 under four chords of the voices above, and
// each chord is given as it ends, read over its own stretch, not when the
// pedal ends; the chords are those Find gives from all the notes at once.
// The pedal is told to the stream as sounding (Sound) from its start on,
// as pitchdetect's Segmenter.Sounding tells it. Where the pedal enters
// after the voices above, its first chord is read from where the pedal's
// attack settled (0.15 s in): that chord, and the chords after it, wait
// until the stream is told where (Settles, as pitchdetect's
// Segmenter.Settles tells it 1.5 s into the note's steady part), and
// without that for the pedal's end. Equal temperament at A4 = 440 Hz
// (ISO 16; 440·2^(n/12)); our own scenario.
func TestStreamGivesTheChordsAboveAPedalAsTheyEnd(t *testing.T) {
	tu := target.Default()
	parse := func(s string) target.Note { n, _ := target.ParseNote(s); return n }
	const pedalEnd = 8.2
	for _, c := range []struct {
		enters float64
		tells  bool // where the pedal settled, 1.7 s after it began
	}{{0, true}, {0.3, true}, {0.3, false}} {
		enters := c.enters
		who := []string{"b", "t", "a", "s"}
		var notes []Note
		add := func(p int, name string, from, to float64) {
			n := parse(name)
			notes = append(notes, Note{Start: from, End: to, Who: who[p], Note: n, Hz: tu.Target(n) * math.Exp2(2.0*float64(p)/1200)})
		}
		add(0, "C2", enters, pedalEnd)
		notes[0].Settled = enters + 0.15
		for k, chord := range [][3]string{{"E3", "G3", "C4"}, {"F3", "A3", "C4"}, {"G3", "C4", "E4"}, {"E3", "G3", "Bb3"}} {
			for p, name := range chord {
				add(p+1, name, 0.2+2*float64(k), 2*float64(k+1))
			}
		}
		whole := make([]Track, len(who)) // for Find: the frames never forgotten
		live := make([]Track, len(who))
		frame := func(tr []Track, i int, at float64) {
			for _, n := range notes {
				if n.Who == who[i] && at >= n.Start && at <= n.End {
					tr[i].Add(at, n.Hz*math.Exp2(math.Sin(at*30)*3/1200))
				}
			}
		}
		for step := 0; step <= 900; step++ {
			for i := range who {
				frame(whole, i, float64(step)/100)
			}
		}
		for i := range notes {
			notes[i].Frames = &whole[slices.Index(who, notes[i].Who)]
		}
		want := Find(notes, tu, target.DefaultSeventh)
		if len(want) != 4 {
			t.Fatalf("pedal from %.1f s: Find gives %d chords, want 4", enters, len(want))
		}
		s := Stream{Seventh: target.DefaultSeventh}
		var got []Chord
		var givenAt []float64
		added := make([]bool, len(notes))
		for step := 0; step <= 900; step++ {
			at := float64(step) / 100
			for i := range who {
				frame(live, i, at)
			}
			horizon := at
			var sounding []Note
			for k, n := range notes {
				switch {
				case !added[k] && n.End < at:
					n.Frames = &live[slices.Index(who, n.Who)]
					s.Add(n)
					added[k] = true
				case n.Who == "b" && !added[k] && at >= n.Start+0.2: // sure by now
					o := Note{Start: n.Start, Who: n.Who, Frames: &live[0]}
					if c.tells && at >= n.Start+1.7 {
						o.Settled, o.Settles = n.Settled, true
					}
					sounding = append(sounding, o)
				case !added[k] && n.Start <= at:
					horizon = min(horizon, n.Start)
				}
			}
			if step%10 != 0 {
				continue
			}
			s.Sound(sounding)
			cs, _ := s.Ready(horizon, func(float64) target.Tuning { return tu })
			for range cs {
				givenAt = append(givenAt, at)
			}
			got = append(got, cs...)
			for i := range live {
				live[i].Forget(s.From())
			}
		}
		if len(got) != len(want) {
			t.Fatalf("pedal from %.1f s: %d chords given, want %d", enters, len(got), len(want))
		}
		for i, w := range want {
			g := got[i]
			if g.Start != w.Start || g.End != w.End || g.Name() != w.Name() || !slices.EqualFunc(g.Members, w.Members, func(a, b target.HeardMember) bool { return a.Hz == b.Hz && a.Note == b.Note }) {
				t.Errorf("pedal from %.1f s, chord %d: %s %.2f–%.2f s %+v, want %s %.2f–%.2f s %+v", enters, i, g.Name(), g.Start, g.End, g.Members, w.Name(), w.Start, w.End, w.Members)
			}
		}
		for i := range 3 {
			late := givenAt[i] - want[i].End
			waits := enters > 0.2 && !c.tells // the pedal entered on the first chord, where it settled untold
			if !waits && late > 0.35 || waits && givenAt[i] < pedalEnd {
				t.Errorf("pedal from %.1f s: chord %d (%s, ends %.1f s) given at %.1f s", enters, i, want[i].Name(), want[i].End, givenAt[i])
			}
		}
		t.Logf("pedal from %.1f s: chords given at %v s", enters, givenAt)
	}
}
