// Package ui is fifthline's live meter: a terminal screen built around the
// line of fifths. The key's twelve spellings lie along one row in fifths
// order, the held note is lit at its place, and its other spelling (twelve
// fifths away, off the window's end) is written beside the row with its own
// cents. Above it the spelled note and its cents stand in large block
// glyphs, readable from a music stand; below it runs a ±50 ¢ trace of the
// last seconds and a status line.
//
// With Options.Group the meter shows a group instead (group.go, groupview.go):
// a row per player or voice with its spelled note, its cents against the
// temperament and, in the chord the rows make, against just above the
// sounding root; the chord, the group's drift, and the chord's members on
// one line by their just cents. It is fed by OnGroupFrame.
//
// The screen is a thin edge: model holds what the meter knows, the region
// functions (bigLines, words, fifthsRows, trace, …) turn it into plain text
// lines with roles, and only Meter touches tview and tcell. Tuning logic
// stays in package target; sound and pitch stay in session. It plays
// nothing itself (its drone and reference keys ask a Sound, which the
// command provides) and writes no files.
package ui
