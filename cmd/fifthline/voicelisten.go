package main

import (
	"cmp"
	"context"
	"encoding/csv"
	"math"
	"time"

	"fifthline/harmony"
	"fifthline/session"
	"fifthline/source"
	"fifthline/target"
)

// listenVoices is listen --plain --voices: the CSV header, then each voice's
// held note as it ends, flushed at once (start_s counts from the start of
// capture). With --chords the header is the chord rows' and each chord's
// rows come as soon as no note still sounding can change the chord.
func listenVoices(ctx context.Context, e *env, src source.Source, name string, tu target.Tuning, vo voiceOptions, j *journalSink) error {
	w := csv.NewWriter(e.stdout)
	head := append(session.Header(false), voiceColumns...)
	if vo.chords {
		head = voiceChordHeader(false)
	}
	w.Write(head)
	w.Flush()
	if err := w.Error(); err != nil {
		return err
	}
	chords := vo.liveChords(session.NewTunings(tu), func(c harmony.Chord, voices []int, doubled []bool, tu target.Tuning) error {
		journalVoiceChord(j, name, tu, c, voices)
		for _, row := range voiceChordRows(c, voices, doubled) {
			w.Write(row.record(false))
		}
		w.Flush()
		return w.Error()
	})
	if chords != nil {
		vo.onMoment = func(at, earliest float64) { chords.ready(at, earliest) }
	}
	err := hearVoices(ctx, src, name, fixed(tu), vo, func(float64) {}, func(n voiceNote) error {
		j.row(n.Event, n.extra(), time.Time{})
		if chords != nil {
			return chords.note(n)
		}
		w.Write(n.record(false))
		w.Flush()
		return w.Error()
	})
	if chords != nil { // those still open when listening stopped
		return cmp.Or(err, chords.ready(math.Inf(1), math.Inf(1)))
	}
	return cmp.Or(err, w.Error())
}
