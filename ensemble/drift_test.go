package ensemble

import (
	"math"
	"strings"
	"testing"

	"fifthline/pitchdetect"
	"fifthline/target"
)

// c3 is C3 in equal temperament at A4 = 440 Hz (ISO 16; 440·2^(−21/12)).
var c3 = 440 * math.Exp2(-21.0/12)

// justC is a C major chord tuned just (3/2, 5/4 and octaves above the
// sounding root: common practice) on a C3 moved by shift cents.
func justC(shift float64) []float64 {
	c := c3 * math.Exp2(shift/1200)
	return []float64{c, c * 3 / 2, c * 5 / 2, c * 4}
}

// sag is the group's pitch in cents at t seconds of our own scenario: a
// choir sagging 10 ¢ over 30 s.
func sag(t float64) float64 { return -10 * t / 30 }

// A just chord is not drift: C major with its pure third 13.69 ¢ below
// equal temperament's (400 − 386.31 ¢, from the definitions) reads 0 ¢ of
// drift; the whole chord moved by a sag reads the sag, and one member out
// of tune does not move the median.
func TestDriftTakesTheChordsJustTuningOut(t *testing.T) {
	tu := target.Default()
	for _, c := range []struct {
		name  string
		shift float64
		wrong float64 // the fifth's own error, cents
	}{
		{"just on the tempered root", 0, 0},
		{"sagged 7 ¢", -7, 0},
		{"sagged 7 ¢, fifth 25 ¢ sharp", -7, 25},
	} {
		d := NewDrift(tu, target.DefaultSeventh)
		if _, ok := d.Cents(); ok {
			t.Fatalf("%s: a drift before anything sounded", c.name)
		}
		for k := range 30 {
			hz := justC(c.shift)
			hz[1] *= math.Exp2(c.wrong / 1200)
			d.Moment(float64(k)*DriftTick, hz)
		}
		got, ok := d.Cents()
		if !ok || math.Abs(got-c.shift) > 0.01 {
			t.Errorf("%s: drift %+.3f ¢ (known %v), want %+.2f", c.name, got, ok, c.shift)
		}
		if in := d.Chords(); in.NThirds != 30 || math.Abs(in.Thirds) > 0.01 || math.Abs(in.Fifths-c.wrong) > 0.01 {
			t.Errorf("%s: inside the chords %+v, want thirds just, fifths %.0f ¢ off", c.name, in, c.wrong)
		}
	}
}

// A melody alone reads its own cents; a note that sits on the other
// spelling (in C major the key spells G♯; quarter-comma meantone's A♭ lies
// 41.06 ¢ above it: 128/125, the lesser diesis, from its definition) says
// nothing about where the group is and is left out.
func TestDriftLeavesOutTheOtherSpelling(t *testing.T) {
	tm, err := target.ParseTemperament("meantone:1/4")
	if err != nil {
		t.Fatal(err)
	}
	tu := target.Default()
	tu.Temperament = tm
	d := NewDrift(tu, target.DefaultSeventh)
	g4, gs4 := tu.Target(mustNote(t, "G4")), tu.Target(mustNote(t, "G#4"))
	ab4 := gs4 * 128 / 125
	if r := tu.Classify(ab4); !r.OnOther {
		t.Fatalf("A♭4 read as %v, not on the other spelling", r)
	}
	for k := range 20 {
		d.Moment(float64(k)*DriftTick, []float64{g4 * math.Exp2(-3.0/1200)})
		d.Moment((float64(k)+0.5)*DriftTick, []float64{ab4})
	}
	if got, ok := d.Cents(); !ok || math.Abs(got+3) > 0.01 {
		t.Errorf("drift %+.3f ¢ (known %v), want −3 from the G alone", got, ok)
	}
}

func mustNote(t *testing.T, s string) target.Note {
	t.Helper()
	n, err := target.ParseNote(s)
	if err != nil {
		t.Fatal(err)
	}
	return n
}

// Frames, as the live reading gives them (a frame every 5 ms per player),
// follow a sag: the running drift lags its window's middle, DriftSeconds/2;
// a rest and a changing note inside a moment do not disturb it.
func TestDriftFollowsFramesLive(t *testing.T) {
	d := NewDrift(target.Default(), target.DefaultSeventh)
	const hop = 0.005
	for k := range int(30 / hop) {
		tm := float64(k) * hop
		hz := justC(sag(tm))
		for i, f := range hz {
			e := pitchdetect.Estimate{Time: tm, Hz: f, Voiced: true}
			if i == 3 && math.Mod(tm, 2) > 1.5 { // the top voice rests half a second in two
				e = pitchdetect.Estimate{Time: tm}
			}
			d.Frame(i, e)
		}
		if k > 0 && k%int(5/hop) == 0 { // every 5 s from 5 s on
			got, ok := d.Cents()
			want := sag(tm - DriftSeconds/2)
			if !ok || math.Abs(got-want) > 0.2 {
				t.Errorf("at %.1f s: drift %+.2f ¢ (known %v), want %+.2f", tm, got, ok, want)
			}
		}
	}
}

// Over a whole take the points stand where the sag happened: within 0.2 ¢
// of it at every point, from the held notes (chords of 2 s, each note's
// pitch its mean over the chord, as the segmenter gives it).
func TestDriftOverATake(t *testing.T) {
	var notes []Sounding
	for start := 0.0; start < 30; start += 2 {
		for _, f := range justC(sag(start + 1)) {
			notes = append(notes, Sounding{Start: start, End: start + 1.95, Hz: f})
		}
	}
	td := DriftOver(notes, target.Default(), target.DefaultSeventh)
	if len(td.Points) == 0 {
		t.Fatal("no drift over the take")
	}
	for _, p := range td.Points {
		if math.Abs(p.Cents-sag(p.Time)) > 0.4 {
			t.Errorf("at %.2f s: %+.2f ¢, want %+.2f", p.Time, p.Cents, sag(p.Time))
		}
	}
	first, last, _ := td.Ends()
	if first.Time > 1 || last.Time < 29 {
		t.Errorf("points from %.2f to %.2f s, want the take's ends", first.Time, last.Time)
	}
	if _, ok := td.At(100); ok {
		t.Error("a drift far after the take")
	}
}

// Whatever a journal holds — notes out of order, overlapping, empty, of
// no pitch or at infinity — the drift over it is read without a panic and
// every point is a number of cents.
func FuzzDriftOver(f *testing.F) {
	f.Add(0.0, 2.0, 130.81, 0.0, 2.0, 196.2, 2.1, 4.0, 440.0)
	f.Add(5.0, 1.0, -1.0, math.Inf(1), 0.0, 0.0, 1e9, 1e9+1, 1e-300)
	f.Add(1e300, 1e300, 440.0, -1e300, -1e300, 220.0, 1e17, 1e17+2, 330.0)
	f.Fuzz(func(t *testing.T, s1, e1, h1, s2, e2, h2, s3, e3, h3 float64) {
		notes := []Sounding{{s1, e1, h1}, {s2, e2, h2}, {s3, e3, h3}}
		for _, p := range DriftOver(notes, target.Default(), target.DefaultSeventh).Points {
			if math.IsNaN(p.Cents) || math.IsInf(p.Cents, 0) {
				t.Fatalf("%v: point %v", notes, p)
			}
		}
	})
}

// The drift line's move is the difference of its ends as they are written:
// a reader subtracts the two numbers printed, so 1.95 → 0.04 (written 2.0 ¢
// sharp → 0.0 ¢) moved 2.0 ¢ flat, not the unrounded 1.9.
func TestDriftWordsMoveByTheEndsAsWritten(t *testing.T) {
	td := TakeDrift{Points: []DriftPoint{{0, 1.95}, {5, 0.04}}}
	want := "group drift 2.0 ¢ sharp → 0.0 ¢ over 5 s (moved 2.0 ¢ flat)"
	if got := td.Words(); !strings.HasPrefix(got, want) {
		t.Errorf("%q, want it to begin %q", got, want)
	}
}
