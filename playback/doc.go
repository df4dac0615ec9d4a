// Package playback is the edge where fifthline's own sound leaves: a Player
// opens a PortAudio output stream and sounds drones and short reference
// tones made by package drone, quietly by default and never above its level.
//
// The stream's callback only mixes what the Player's methods have prepared:
// new sounds reach it through atomic hand-offs, so it never waits for a lock
// and never allocates. Synthesis and cancelling live in package drone;
// choosing notes and their targets in package target.
package playback
