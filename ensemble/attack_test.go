package ensemble

import (
	"math"
	"testing"

	"fifthline/pitchdetect"
)

// A frame the ownership test gives away at an onset or at a release is
// held back until the player's next frame tells whose it was. Frames of
// exact synthetic truth at the detector's default hop (512 samples at
// 48 kHz); pitches in equal temperament at A4 = 440 Hz (ISO 16): G4
// 392.00 Hz, G5 783.99 Hz.
const g4, g5 = 391.995, 783.991

// frames is a player's frame track: silence, then a note of n frames at
// hz rising 2 ¢ over its first ten frames (an attack settling), then
// silence.
func frames(attack []float64, n int, hz float64) []pitchdetect.Estimate {
	const hop = 512 / rate
	var out []pitchdetect.Estimate
	add := func(f, level float64) {
		e := pitchdetect.Estimate{Time: float64(len(out)) * hop, Hz: f, Voiced: f > 0, Level: level}
		if f > 0 {
			e.Confidence = 0.9
		}
		out = append(out, e)
	}
	for range 20 {
		add(0, -100)
	}
	for _, f := range attack {
		add(f, -20)
	}
	for i := range n {
		add(hz*math.Exp2((math.Min(float64(i), 10)/10*2-2)/1200), -20)
	}
	for range 20 {
		add(0, -100)
	}
	return out
}

// readTrack feeds a voice's segmenter the track, frames at the indices in
// blanked given away as bleed, as Run does; it returns the notes.
func readTrack(track []pitchdetect.Estimate, blanked map[int]bool) []pitchdetect.Held {
	v := &voice{seg: pitchdetect.NewSegmenter(512 / rate)}
	var notes []pitchdetect.Held
	deliver := func(_ *voice, h pitchdetect.Held) error { notes = append(notes, h); return nil }
	for i, e := range track {
		heard := e
		if blanked[i] {
			heard = unvoiced(e)
		}
		prev := v.last
		v.steady(heard.Hz)
		if err := v.push(e, blanked[i], prev, deliver); err != nil {
			panic(err)
		}
	}
	v.release(deliver)
	if h, ok := v.seg.Flush(); ok {
		notes = append(notes, h)
	}
	return notes
}

func TestFramesGivenAwayAtAnOnsetOrReleaseAreTakenBack(t *testing.T) {
	for _, c := range []struct {
		name    string
		track   []pitchdetect.Estimate
		blanked map[int]bool
	}{
		// A flute's G5 whose first frame reads G4, an octave low, where a
		// bassoon's C3 sounds its third harmonic.
		{"attack read an octave low", frames([]float64{g4}, 60, g5), map[int]bool{20: true}},
		// A violin entering in unison with another: its first two frames
		// sound louder on the other's channel.
		{"attack in unison", frames(nil, 60, g5), map[int]bool{20: true, 21: true}},
		// A clarinet's last frame, its neighbours' attacks louder at its
		// harmonics.
		{"release", frames(nil, 60, g5), map[int]bool{79: true}},
	} {
		alone := readTrack(c.track, nil)
		got := readTrack(c.track, c.blanked)
		if len(alone) != 1 || len(got) != 1 {
			t.Fatalf("%s: %d notes, alone %d; want 1", c.name, len(got), len(alone))
		}
		if got[0] != alone[0] {
			t.Errorf("%s: read %+v; alone %+v", c.name, got[0], alone[0])
		}
	}
}

// A clarinet's last frame given away, then two frames of a neighbour's
// G3 attack read on its channel: the note ends as alone, the G3 frames
// stay the neighbour's.
func TestAReleaseUnderANeighboursAttackIsTakenBack(t *testing.T) {
	const g3 = 195.998
	track := frames(nil, 60, g5)
	for _, i := range []int{80, 81} {
		track[i] = pitchdetect.Estimate{Time: track[i].Time, Hz: g3, Voiced: true, Confidence: 0.9, Level: -30}
	}
	alone := append([]pitchdetect.Estimate(nil), track...)
	alone[80], alone[81] = unvoiced(alone[80]), unvoiced(alone[81])
	got, want := readTrack(track, map[int]bool{79: true, 80: true, 81: true}), readTrack(alone, nil)
	if len(got) != 1 || len(want) != 1 || got[0] != want[0] {
		t.Errorf("read %+v; alone %+v", got, want)
	}
}

// A resting player's channel reading a neighbour's note, every frame given
// away, stays silent; a player whose unison partner holds on after them
// ends where their own frames end.
func TestFramesGivenAwayToOthersStayAway(t *testing.T) {
	resting := frames(nil, 60, g4)
	all := map[int]bool{}
	for i := range resting {
		all[i] = true
	}
	if notes := readTrack(resting, all); len(notes) != 0 {
		t.Errorf("a resting channel read %+v", notes)
	}
	// Own frames 20–59, then the partner's bleed at the same pitch.
	track := frames(nil, 60, g5)
	later := map[int]bool{}
	for i := 60; i < 80; i++ {
		later[i] = true
	}
	cut := append([]pitchdetect.Estimate(nil), track...)
	for i := 60; i < 80; i++ {
		cut[i] = unvoiced(cut[i])
		cut[i].Level = -100
	}
	got, want := readTrack(track, later), readTrack(cut, nil)
	if len(got) != 1 || len(want) != 1 || got[0].End != want[0].End {
		t.Errorf("held on after a unison partner: read %+v; own frames alone %+v", got, want)
	}
}

// What OnFrame is handed is what the notes are read from: a violin
// entering in unison, its first two frames given away and taken back, is
// seen with its pitch from its first frame, as alone. Its moments wait
// while those frames are held, so every player's frame of a moment still
// comes before the next moment's, in player order.
func TestFramesTakenBackAreSeenWithTheirPitch(t *testing.T) {
	tracks := [][]pitchdetect.Estimate{frames(nil, 60, g5), frames(nil, 60, g4)}
	blanked := []map[int]bool{{20: true, 21: true}, nil}
	voices := []*voice{{seg: pitchdetect.NewSegmenter(512 / rate)}, {seg: pitchdetect.NewSegmenter(512 / rate)}}
	deliver := func(*voice, pitchdetect.Held) error { return nil }
	var seen [2][]pitchdetect.Estimate
	var order []int
	onFrame := func(i int, e pitchdetect.Estimate) {
		seen[i] = append(seen[i], e)
		order = append(order, i)
	}
	for k := range tracks[0] {
		for i, v := range voices {
			prev := v.last
			v.steady(tracks[i][k].Hz)
			if err := v.push(tracks[i][k], blanked[i][k], prev, deliver); err != nil {
				t.Fatal(err)
			}
		}
		decided(voices, onFrame)
	}
	for _, v := range voices {
		v.release(deliver)
	}
	decided(voices, onFrame)
	for i, track := range tracks {
		if len(seen[i]) != len(track) {
			t.Fatalf("player %d: %d frames seen, %d read", i, len(seen[i]), len(track))
		}
		for k, e := range seen[i] {
			if e != track[k] {
				t.Errorf("player %d, frame %d: seen %+v, read alone %+v", i, k, e, track[k])
			}
		}
	}
	for k, i := range order {
		if i != k%2 {
			t.Fatalf("frame %d of the stream is player %d's: not every moment in player order", k, i)
		}
	}
}
