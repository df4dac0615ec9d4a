// Package journal keeps the rehearsal journal: one CSV line per held note,
// appended as each note ends, with the wall-clock time, the session, who
// played and the tuning the note was read in, then the same held-note columns
// analyze prints, then a note's voice and, on the rows of a chord heard with
// --chords (one per member, after its notes), the chord, the member's role
// and its cents from just (Extra). A spreadsheet opens it as it is; report
// reads it back.
//
// It is the file edge only: Writer appends safely (header once, each line
// written as the note ends, fsynced regularly, a torn last line mended before
// appending, disk failures turned into a status instead of a stopped
// session) and Read parses leniently (a torn or damaged line is skipped with
// a warning). It computes no statistics; package report does.
package journal
