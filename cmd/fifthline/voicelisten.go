package main

import (
	"cmp"
	"context"
	"math"

	"fifthline/harmony"
	"fifthline/multipitch"
	"fifthline/session"
	"fifthline/target"
)

// listenVoices is listen --plain --voices: the CSV header, then each voice's
// held note as it ends, flushed at once (start_s counts from the start of
// capture). With --chords the header is the chord rows' and each chord's
// rows come as soon as no note still sounding can change the chord.
// FIFTHLINE_TIMING logs the voices read and the input's onsets (timing.go).
func listenVoices(ctx context.Context, e *env, in timedInput, name string, tu target.Tuning, vo voiceOptions, j *journalSink) error {
	w, timing, err := beginPlain(e, groupHead(false, vo.chords, voiceColumns, voiceChordHeader), in.SampleRate())
	if err != nil {
		return err
	}
	defer timing.close()
	vo.onFrame = func(f multipitch.Frame, _ []bool) { timing.voicesFrame(f) }
	src := timing.withClockOne(in, "voices")
	var chordRows func(harmony.Chord, []int, []bool, target.Tuning) error
	if vo.chords {
		chordRows = func(c harmony.Chord, voices []int, doubled []bool, tu target.Tuning) error {
			journalVoiceChord(j, name, tu, c, voices)
			for _, row := range voiceChordRows(c, voices, doubled) {
				w.Write(row.record(false))
			}
			w.Flush()
			return w.Error()
		}
	}
	// Each note's row once its chords are known, spelled from them as
	// analyze spells it (heldrows.go).
	chords := vo.liveChords(session.NewTunings(tu), chordRows, func(n voiceNote) error {
		j.heardRow(n.Event, n.extra(), n.heard)
		if vo.chords {
			return nil
		}
		w.Write(n.record(false))
		w.Flush()
		return w.Error()
	})
	err = hearVoices(ctx, src, name, fixed(tu), vo, func(float64) {}, chords.note)
	// The chords and rows still open when listening stopped.
	return cmp.Or(err, chords.ready(math.Inf(1), math.Inf(1), nil), w.Error())
}
