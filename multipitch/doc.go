// Package multipitch hears two to four voices sounding together on one
// channel and measures each to a fraction of a cent.
//
// An Estimator is built like a single-pitch detector (sample rate, window,
// hop), fed blocks of samples, and hands back one Frame per hop with the
// voices it hears, lowest first: fundamental (Hz), amplitude, and whether an
// octave or unison doubling lies on it. It works in two stages, both from
// published methods:
//
//   - Candidates: the whitened spectrum's harmonic summation with iterative
//     estimation and cancellation (A. Klapuri, "Multiple fundamental
//     frequency estimation based on harmonicity and spectral smoothness",
//     IEEE Trans. Speech and Audio Processing 11(6), 2003; A. Klapuri,
//     "Multiple fundamental frequency estimation by summing harmonic
//     amplitudes", ISMIR 2006). The strongest fundamental is taken, its
//     partials are cancelled from the spectrum as far as a smooth spectral
//     envelope allows (what stands above it may belong to another voice), and
//     the search repeats.
//   - Precision: one nonlinear least-squares fit of all voices' harmonic
//     series at once (M. G. Christensen and A. Jakobsson, "Multi-Pitch
//     Estimation", Morgan & Claypool, 2009): for given fundamentals the
//     partials' complex amplitudes follow by linear least squares, and the
//     fundamentals take Gauss–Newton steps on what is left (variable
//     projection, Golub & Pereyra 1973, with Kaufman's 1975 Jacobian). A
//     partial two voices share — a just major third's root has its 5th
//     partial where the third has its 4th — is explained by both series
//     together instead of being handed to whichever voice was found first,
//     which would pull that voice by cents. The fit runs in the frequency
//     domain on the bins around each partial, with the Hann window's
//     transform in closed form as each partial's shape.
//
// A voice whose pitch moves (a vibrato) is then read again on short
// sub-windows, under half a vibrato cycle, with the others' partials in the
// model and the partials it shares with them left out of its steering; its
// frame pitch is the plain mean of those readings (timeavg.go): one long
// fit weighs a vibrato by loudness, and an instrument loudest at the low
// end of its cycle would read flat of the time average other readers give.
// Two voices the long window puts at the two ends of a wide vibrato, which
// the sub-windows read as one, are one voice (twins.go).
// A voice lying on a lower voice's harmonic, every partial of it shared, is
// steered there by the partials it owns the larger part of, as the long
// window's fit and the lower voice's spectral envelope both judge them
// (collide.go).
//
// A voice whose partials explain nothing the others do not (an octave
// above another voice, a subharmonic guess, a guess on noise) is dropped,
// the lowest first; in that decision each partial may also widen (the
// second-order term of a pitch moving within the window, as in harmonic
// chirp estimation), so that a wandering voice's smeared upper partials
// are its own and not another voice's; a voice an octave above another is
// judged again where settling the fit moved the voice beneath it. A voice whose even partials stand
// above the smooth spectral envelope through its own odd partials (those no
// other voice shares: in a chord the others often cover the neighbours of
// every even one) is marked Doubled: another voice sounds an octave above
// it (a unison double leaves no mark). A voice is never invented to fill a
// requested count.
//
// What is read does not hang on the level, short of clipping: one absolute
// gate (a window under -60 dBFS holds no voice) and every other decision
// against the frame's own spectrum, its noise floor held no lower than
// quietest of its mean power, so that a clean or synthetic take's dither
// 140 dB down is no floor to whiten by or to stand above.
//
// It is pure (no I/O, no cgo) and knows nothing of notes or keys: pruning by
// a key's window is the caller's Accept function. It is not a transcriber of
// fast polyphonic passages: windows are long (a third of a second) because
// held chords are what it is for. Half windows are read beside them: after
// an onset, until a whole window holds the chord, the newest half window is
// read instead, so that a chord's first reading comes within 300 ms; and
// where the half window around a frame's centre hears more voices than the
// whole one, its reading stands (a wide vibrato smears a voice over a whole
// window until it explains too little to pass for one).
package multipitch
