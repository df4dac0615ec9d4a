// Package report turns a rehearsal journal into what a coach asks: for each
// player, key and temperament, how each spelled note sat — count, mean and
// median cents, spread, share within a tolerance, a tendency in plain words,
// how often it sat nearer its other spelling, and how it drifted over the
// rehearsal — as a text table, CSV, JSON or a plot.
//
// The statistics (Summarize) are pure functions of journal entries; the
// renderers write to an io.Writer. It reads no files: package journal does.
package report
