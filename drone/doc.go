// Package drone makes the sound of a drone and takes it out again: it turns
// note frequencies and a timbre into a set of partials, renders them as
// phase-continuous sinusoids with raised-cosine fades through a hard peak
// limiter (Voice, Mixer), and removes known partials from a microphone
// stream before pitch detection (Canceller), so a player can be metered
// while the drone sounds.
//
// It is pure: no devices, files or clocks. Sending samples to a sound card is
// package playback's job; naming notes and choosing their targets is package
// target's.
package drone
