package main

import (
	"cmp"
	"context"
	"encoding/csv"
	"time"

	"fifthline/session"
	"fifthline/source"
	"fifthline/target"
)

// listenVoices is listen --plain --voices: the CSV header, then each voice's
// held note as it ends, flushed at once (start_s counts from the start of
// capture). With --chords the header is the chord rows' and the rows follow
// when listening stops, since a chord is known only once its notes end.
func listenVoices(ctx context.Context, e *env, src source.Source, name string, tu target.Tuning, vo voiceOptions, j *journalSink) error {
	w := csv.NewWriter(e.stdout)
	head := append(session.Header(false), voiceColumns...)
	if vo.chords {
		head = chordHeader(false)
	}
	w.Write(head)
	w.Flush()
	if err := w.Error(); err != nil {
		return err
	}
	var notes []voiceNote
	err := hearVoices(ctx, src, name, fixed(tu), vo, func(float64) {}, func(n voiceNote) error {
		j.row(n.Event, n.extra(), time.Time{})
		if vo.chords {
			notes = append(notes, n)
			return nil
		}
		w.Write(n.record(false))
		w.Flush()
		return w.Error()
	})
	if vo.chords {
		chords := logVoiceChordsOf(j, name, tu, vo.seventh, notes)
		for _, h := range chords {
			for _, c := range voiceChordRecords(h, "", notes) {
				w.Write(c.record(false))
			}
		}
		w.Flush()
	}
	return cmp.Or(err, w.Error())
}
