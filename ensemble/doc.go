// Package ensemble reads a group: one player per channel of a multichannel
// stream (close microphones on an interface, or a multitrack recording),
// each player's held notes read from their own channel, and the chords the
// notes make together.
//
// A close microphone also hears its neighbours, 15–25 dB down and a few
// milliseconds late. Read alone, a resting player's channel then reports a
// neighbour's note. Here each frame is read knowing the others: a pitch
// belongs to the player on whose channel its harmonics are loudest, so a
// frame whose pitch sounds much louder on another channel is that player's
// bleed and is not a note on this one (see Owner).
//
// # The group's drift
//
// The group's drift is how far the whole group has moved from the
// reference: a number of cents that, added to every target, would put the
// group back in tune with itself, apart from how each chord is tuned
// inside.
//
// At each moment (every DriftTick seconds) the pitches sounding together
// give one sample each:
//   - where they make a chord that target.NameChord knows, a member's
//     sample is its root's cents against the temperament plus the member's
//     own just_cents. A chord tuned just therefore gives its root's
//     deviation from every member: a pure major third's −14 ¢ in equal
//     temperament is the chord's tuning, not the group's motion, and a third
//     sung 6 ¢ wide of just counts 6 ¢ only in its own sample;
//   - any other pitch gives its own cents against the temperament, unless
//     it sits on the other spelling (then it says which note was meant, not
//     where the group is) — and a chord whose root does is left out whole.
//
// The drift is the median of the samples over DriftSeconds: a median, so
// that one player out of tune, a wrong note or a misread attack moves it
// by at most one rank; a few seconds, so that it follows a choir's sag over
// a movement but not a single chord's colour.
//
// It is measured against the temperament's targets of the roots: a group
// that tunes each triad just above the key's tonic (and so moves its
// roots off equal temperament) reads that motion as drift; such a group
// is read against just intonation.
//
// Drift reads it as the group plays (constant memory, fed frames or
// moments); DriftOver reads it over a whole take from the held notes.
//
// It is not the audio edge (sources come through source.Multi), nor where
// pitches are named (target) or notes segmented (pitchdetect): it runs one
// detector and segmenter per player and decides ownership between them.
package ensemble
