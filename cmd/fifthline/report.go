package main

import (
	"errors"
	"fmt"
	"path/filepath"
	"slices"
	"strings"
	"time"

	"fifthline/journal"
	"fifthline/report"
	"fifthline/target"
)

func runReport(e *env, args []string) error {
	fs := newFlags("report")
	plotPath := fs.String("plot", "", "also draw the report into FILE.png or FILE.svg")
	format := choiceFlag(fs, "format", "what to print", "table", "csv", "json")
	tolerance := fs.Float64("tolerance", inTuneCents, "cents either side of the target that count as in tune")
	by := fs.String("by", "", "rehearsal: a row per note per rehearsal (recording date), to see progress")
	var f report.Filter
	fs.StringVar(&f.Player, "player", "", "only this player's notes (or this voice's, as the report heads it: \"voice 2\")")
	fs.StringVar(&f.Key, "key", "", "only notes played in this key, e.g. \"G major\"")
	since := fs.String("since", "", "only notes from this date (2026-03-14) or RFC 3339 time on")
	paths, err := parseFlags(e, fs, args)
	if err != nil {
		return err
	}
	if len(paths) == 0 {
		return usagef("report needs one or more journal files (written with --log)")
	}
	if *by != "" && *by != "rehearsal" {
		return usagef("--by %q: the only choice is --by rehearsal", *by)
	}
	if !(*tolerance > 0 && *tolerance <= 100) {
		return usagef("--tolerance %g: give cents above 0, at most 100", *tolerance)
	}
	if f.Key != "" {
		// Read as every command reads --key (a lone g, a German H get their
		// hints), not matched as text that no journal holds.
		if _, err := target.ParseKey(f.Key); err != nil {
			return usagef("--key: %v", err)
		}
	}
	if ext := strings.ToLower(filepath.Ext(*plotPath)); *plotPath != "" && ext != ".png" && ext != ".svg" {
		return usagef("--plot %q: the file must end in .png or .svg", *plotPath)
	}
	if *since != "" {
		if f.Since, err = report.ParseSince(*since, time.Local); err != nil {
			return usagef("%v", err)
		}
	}
	var entries []journal.Entry
	for _, p := range paths {
		es, warns, err := journal.ReadFile(p)
		if err != nil {
			return err
		}
		for _, w := range warns {
			fmt.Fprintf(e.stderr, "fifthline: warning: %s\n", w)
		}
		entries = append(entries, es...)
	}
	all := entries
	entries = f.Apply(entries)
	if len(entries) == 0 {
		return fmt.Errorf("no held notes in %s%s%s", strings.Join(paths, ", "), filterWords(f, *since), whoIsThere(all, f))
	}
	opt := report.Options{Tolerance: *tolerance, ByRehearsal: *by == "rehearsal"}
	groups := report.Summarize(entries, opt)
	// The picture first: a plot that cannot be written fails the command
	// before the table is printed, so stdout is all or nothing.
	if *plotPath != "" {
		if err := report.PlotFile(*plotPath, entries, groups, opt); err != nil {
			return err
		}
	}
	drifts := report.GroupDrifts(entries) // the group's drift, apart from each note's tuning
	switch *format {
	case "csv":
		err = errors.Join(report.WriteCSV(e.stdout, groups, opt), report.WriteGroupCSV(e.stdout, drifts, opt))
	case "json":
		err = report.WriteJSON(e.stdout, groups, opt, drifts...)
	default:
		err = errors.Join(report.WriteText(e.stdout, groups, opt), report.WriteGroupText(e.stdout, drifts))
	}
	return err
}

// filterWords says which filters left nothing: " by Ann, in G major, since 2026-03-14".
// whoIsThere names, when --player kept nobody, the players and voices the
// journals do hold, so a misspelt or forgotten name can be put right.
func whoIsThere(es []journal.Entry, f report.Filter) string {
	if f.Player == "" || len(es) == 0 {
		return ""
	}
	var names []string
	for _, e := range es {
		if who := report.Who(e.Player, e.Voice); who != "" && !slices.Contains(names, who) {
			names = append(names, who)
		}
	}
	if len(names) == 0 {
		return " (its notes name no player)"
	}
	return " (players there: " + strings.Join(names, ", ") + ")"
}

func filterWords(f report.Filter, since string) string {
	var w []string
	if f.Player != "" {
		w = append(w, "by "+f.Player)
	}
	if f.Key != "" {
		w = append(w, "in "+f.Key)
	}
	if since != "" {
		w = append(w, "since "+since)
	}
	if len(w) == 0 {
		return ""
	}
	return " " + strings.Join(w, ", ")
}
