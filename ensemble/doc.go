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
// It is not the audio edge (sources come through source.Multi), nor where
// pitches are named (target) or notes segmented (pitchdetect): it runs one
// detector and segmenter per player and decides ownership between them.
package ensemble
