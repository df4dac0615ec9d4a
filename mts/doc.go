// Package mts writes and reads a keyboard's tuning as MIDI Tuning Standard
// messages (MIDI Manufacturers Association, MIDI Tuning Standard, with its
// bank/dump and scale/octave extensions CA-020 and CA-021): frequency words,
// real-time single-note tuning changes, the bulk tuning dump and the 2-byte
// scale/octave tuning, and a Standard MIDI File that sends them and selects
// the tuning on every channel.
//
// It is for getting a temperament onto a synthesizer or digital keyboard (its
// Standard MIDI File track also writes the phrases tests render with
// fluidsynth). It does not decide what the tuning is (package target does)
// and it opens no files or devices: it builds bytes, and reads them back for
// checks.
package mts
