// Package device is fifthline's one door to PortAudio: initialisation,
// device lists and matching, rate negotiation, streams whose callbacks are
// C (ring.c) handing samples through lock-free rings and waking Go through
// a pipe, stall timeouts, and the bookkeeping of streams that will not
// close. Input carries any set of an interface's channels in one stream;
// Output plays what one goroutine renders ahead.
//
// It is not a source of samples for the analysis (package capture wraps
// Input as one) nor a synthesiser (package playback renders into Output);
// it knows nothing of notes.
package device
