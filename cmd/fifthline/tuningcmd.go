package main

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"text/tabwriter"

	"fifthline/target"
	"fifthline/tuningfile"
)

func runTuning(e *env, args []string) error {
	fs := newFlags("tuning")
	mf := addMusicalFlags(fs)
	save := fs.Bool("save", false, "write the given key, temperament, a4, anchor and transpose to ./fifthline.toml")
	pos, err := parseFlags(e, fs, args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usagef("tuning takes no arguments (got %q)", pos[0])
	}
	if mf.chord != "" && *save {
		return usagef("--chord changes with the music and is not saved; leave it out of tuning --save")
	}
	if wasSet(fs, "seventh") && *save {
		return usagef("--seventh goes with the chords and is not saved; leave it out of tuning --save")
	}
	tu, err := mf.tuning()
	if err != nil {
		return err
	}
	if *save {
		if err := saveTuning(e, mf); err != nil {
			return err
		}
	}
	return printTuning(e, mf, tu)
}

// saveTuning writes the flags given, over what ./fifthline.toml already
// holds, so that "tuning --save --a4 415" changes only the reference.
func saveTuning(e *env, mf *musicalFlags) error {
	local, err := readTuningFile(localTuningPath)
	if err != nil {
		return err
	}
	var v tuningfile.Values
	if local != nil {
		v = local.values
		// A temperament file stays as the folder's file wrote it.
		if rel, err := filepath.Rel(".", v.Temperament); err == nil && v.Temperament != "" {
			v.Temperament = rel
		}
	}
	var saved []string
	for _, name := range tuningfile.Fields {
		if mf.origin[name] == fromFlag {
			*v.Field(name) = *mf.field(name)
			saved = append(saved, name)
		}
	}
	if len(saved) == 0 {
		return usagef("tuning --save: give the flags to save, e.g. --key \"G major\" --temperament meantone:1/4 --a4 415")
	}
	// Written whole to a temporary file first, so that an interruption
	// leaves the old file or the new one, never half of one.
	tmp, err := os.CreateTemp(".", ".fifthline-*.toml")
	if err != nil {
		return err
	}
	_, werr := tmp.Write(tuningfile.Encode(v))
	if err := errors.Join(werr, tmp.Chmod(0o644), tmp.Close()); err != nil {
		os.Remove(tmp.Name())
		return err
	}
	if err := os.Rename(tmp.Name(), tuningfile.Name); err != nil {
		os.Remove(tmp.Name())
		return err
	}
	for _, name := range saved {
		mf.origin[name] = localTuningPath
	}
	fmt.Fprintf(e.stderr, "fifthline: saved %s to %s\n", strings.Join(saved, ", "), localTuningPath)
	return nil
}

// printTuning is the table: the tuning in one line, then each value and
// where it came from.
func printTuning(e *env, mf *musicalFlags, tu target.Tuning) error {
	fmt.Fprintln(e.stdout, tu)
	tw := tabwriter.NewWriter(e.stdout, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "setting\tvalue\tfrom\t")
	for _, name := range tuningfile.Fields {
		v := *mf.field(name)
		switch {
		case name == "transpose" && v == "":
			v = "none (sounding pitch)"
		case name == "anchor" && v == "" && tu.Anchored() == target.AnchorTonic:
			v = "tonic (just keeps its tonic)" // the one in force, not the rule
		case name == "anchor" && v == "":
			v = "a4"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t\n", name, v, mf.origin[name])
	}
	if mf.chord != "" {
		fmt.Fprintf(tw, "chord\t%s\t%s\t\n", mf.chord, fromFlag)
		if f := tu.Chord.SeventhFraction(); f != "" {
			from := fromDefault
			if wasSet(mf.fs, "seventh") {
				from = fromFlag
			}
			fmt.Fprintf(tw, "seventh\t%s\t%s\t\n", f, from)
		}
	}
	return tw.Flush()
}
