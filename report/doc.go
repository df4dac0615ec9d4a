// Package report turns rehearsal journals into what a coach asks: for each
// player in each tuning (key, temperament, transposition, declared chord —
// never pooled), how each spelled note sat, per octave, in all octaves
// together and as a whole, optionally once per rehearsal (recording date):
// count, mean and median cents, share within a tolerance, a tendency in
// words that agrees with that share, the vibrato's full width, how the
// notes drifted within a rehearsal, and the notes that sat on the other
// spelling — counted apart with their own mean against that spelling, and
// left out of everything else; and, where the journal holds chords heard,
// where the player (or voice) sat in them per chord quality and member, in
// cents from just. It writes a text table, CSV, JSON or a plot.
//
// Two deviations, two names, one definition (root-mean-square deviation
// from the mean, divisor n): scatter, between the notes' cents; spread,
// within one held note, as in the journal and on the meter (pooled over
// notes as a root mean square).
//
// The statistics (Summarize) are pure functions of journal entries; the
// renderers write to an io.Writer. It reads no files (package journal does)
// and judges no readings: whether a note sat on the other spelling is the
// journal's verdict.
package report
