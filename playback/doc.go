// Package playback is the edge where fifthline's own sound leaves: a Player
// sounds drones and short reference tones made by package drone on an
// output stream of package device, quietly by default and never above its
// level.
//
// A goroutine renders ahead into the output's ring and the stream's C
// callback only copies out; new sounds reach the renderer through atomic
// hand-offs, so it never waits for a lock and never allocates. Synthesis
// and cancelling live in package drone; choosing notes and their targets
// in package target.
package playback
