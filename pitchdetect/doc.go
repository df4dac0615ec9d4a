// Package pitchdetect hears the pitch of a single held note in a stream of
// samples and groups the frame track into held notes.
//
// A Detector turns blocks of samples into one Estimate per hop: a coarse
// period from the McLeod normalised square difference function (NSDF,
// computed through the FFT), an octave and fifth check against the harmonic
// spectrum, then a weighted least-squares harmonic-comb fit whose partial
// frequencies come from the phase advance between two Blackman–Harris
// windowed spectra a few milliseconds apart. While a note holds, each frame is
// seeded with the last pitch and the NSDF is refreshed every eighth hop; the
// octave and fifth checks still run on every frame. A Segmenter turns the
// frame track into Held notes with onset, offset, centre pitch, spread and
// vibrato.
//
// It is not a polyphonic transcriber, does no I/O, and knows nothing about
// notes, keys or temperaments: it reports hertz, seconds and cents only.
package pitchdetect
