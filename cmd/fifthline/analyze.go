package main

import (
	"context"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"strconv"
	"text/tabwriter"

	"fifthline/capture"
	"fifthline/session"
	"fifthline/target"
)

func init() {
	register("analyze", "read WAV recordings and list their held notes (or the frame track)", runAnalyze)
}

type analyzeOptions struct {
	format   string
	frames   bool
	channel  int
	recorded recordedFlag
}

func runAnalyze(e *env, args []string) error {
	fs := newFlags("analyze")
	mf := addMusicalFlags(fs)
	var opt analyzeOptions
	fs.StringVar(&opt.format, "format", "csv", "table, csv or json")
	fs.BoolVar(&opt.frames, "frames", false, "print the frame track (time_s,hz,confidence…) instead of held notes")
	fs.IntVar(&opt.channel, "channel", 1, "channel to read, counted from 1")
	fs.Var(&opt.recorded, "recorded", "when the take was played (2026-11-24, \"2026-11-24 19:30\" or RFC 3339), for the journal; with several files, each began then; default: each file's Broadcast Wave bext time, else its modification time")
	jf := addJournalFlags(fs)
	files, err := parseFlags(e, fs, args)
	if err != nil {
		return err
	}
	if len(files) == 0 {
		return usagef("analyze needs at least one recording (WAV, FLAC, MP3…)")
	}
	if opt.format != "table" && opt.format != "csv" && opt.format != "json" {
		return usagef("--format %q: use table, csv or json", opt.format)
	}
	if opt.channel < 1 {
		return usagef("--channel %d: channels count from 1", opt.channel)
	}
	tu, err := mf.tuning()
	if err != nil {
		return err
	}
	var out eventWriter
	if opt.frames {
		out = newFrameWriter(e.stdout, opt.format, len(files) > 1)
	} else {
		out = newNoteWriter(e.stdout, opt.format, len(files) > 1)
	}
	j, err := jf.open(e)
	if err != nil {
		return err
	}
	for i, path := range files {
		if err := analyzeFile(e, path, tu, opt, out, j); err != nil {
			if i > 0 {
				out.Close() // what the earlier files gave still reaches stdout
			}
			return errors.Join(err, j.close())
		}
	}
	return errors.Join(out.Close(), j.close())
}

func analyzeFile(e *env, path string, tu target.Tuning, opt analyzeOptions, out eventWriter, j *journalSink) error {
	w, err := capture.OpenRecording(path, opt.channel)
	if err != nil {
		return err
	}
	defer w.Close()
	start := takeStart(opt.recorded, w)
	progress := newProgress(e.stderr, path, w.Duration())
	defer progress.Done()
	src := &countingSource{Source: w, progress: progress}
	err = session.Run(e.ctx, src, session.Options{
		Name:    path,
		Tunings: session.NewTunings(tu),
		OnFrame: func(f session.Frame) { out.Frame(path, f) },
		OnNote: func(ev session.Event) error {
			j.noteAt(ev, start)
			return out.Note(ev)
		},
	})
	if errors.Is(err, context.Canceled) {
		return fmt.Errorf("%s: interrupted; the notes before it are written", path)
	}
	if err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	if w.Truncated() {
		fmt.Fprintf(e.stderr, "fifthline: warning: %s is shorter than its header says; read what was there\n", path)
	}
	return nil
}

// countingSource reports how far through a file the reading is.
type countingSource struct {
	capture.Source
	progress *progress
	read     int64
}

func (c *countingSource) Read(p []float32) (int, error) {
	n, err := c.Source.Read(p)
	c.read += int64(n)
	c.progress.At(float64(c.read) / c.SampleRate())
	return n, err
}

// eventWriter is where analyze sends what it hears; a held-note writer
// ignores frames and a frame writer ignores notes.
type eventWriter interface {
	Frame(path string, f session.Frame)
	Note(ev session.Event) error
	Close() error
}

type noteWriter struct {
	format   string
	withFile bool
	csv      *csv.Writer
	tab      *tabwriter.Writer
	json     []map[string]any
	out      io.Writer
	started  bool
}

func newNoteWriter(w io.Writer, format string, withFile bool) *noteWriter {
	return &noteWriter{format: format, withFile: withFile, csv: csv.NewWriter(w), tab: tabwriter.NewWriter(w, 0, 0, 2, ' ', 0), out: w}
}

func (nw *noteWriter) Frame(string, session.Frame) {}

func (nw *noteWriter) Note(ev session.Event) error {
	rec := ev.Record(nw.withFile)
	switch nw.format {
	case "csv":
		if !nw.started {
			nw.csv.Write(session.Header(nw.withFile))
			nw.started = true
		}
		nw.csv.Write(rec)
		nw.csv.Flush()
		return nw.csv.Error()
	case "json":
		obj := jsonObject(session.Header(nw.withFile), rec)
		obj["verdict"] = ev.Reading.Verdict()
		nw.json = append(nw.json, obj)
		return nil
	}
	if !nw.started {
		fmt.Fprintln(nw.out, ev.Tuning)
		fmt.Fprintln(nw.tab, tableHead(nw.withFile))
		nw.started = true
	}
	r := ev.Reading
	line := fmt.Sprintf("%7.2f\t%7.2f\t%s\t%.2f\t%s\t%s\t", ev.Start, ev.End, r.Written, r.Hz, target.FormatCents(r.Deviation, 1), r.OtherWords())
	if nw.withFile {
		line = ev.Source + "\t" + line
	}
	fmt.Fprintln(nw.tab, line)
	return nil
}

func tableHead(withFile bool) string {
	h := "start\tend\tnote\tHz\tcents\tother spelling\t"
	if withFile {
		h = "file\t" + h
	}
	return h
}

func (nw *noteWriter) Close() error {
	switch nw.format {
	case "json":
		if nw.json == nil {
			nw.json = []map[string]any{}
		}
		enc := json.NewEncoder(nw.out)
		enc.SetIndent("", "  ")
		return enc.Encode(nw.json)
	case "table":
		if !nw.started {
			fmt.Fprintln(nw.out, "no held notes")
		}
		return nw.tab.Flush()
	}
	if !nw.started {
		nw.csv.Write(session.Header(nw.withFile))
	}
	nw.csv.Flush()
	return nw.csv.Error()
}

// jsonObject pairs a CSV header with a record, keeping numbers and booleans
// typed so that other tools need not convert them.
func jsonObject(header, rec []string) map[string]any {
	obj := make(map[string]any, len(header))
	for i, k := range header {
		v := rec[i]
		switch {
		case v == "true" || v == "false":
			obj[k] = v == "true"
		case isNumber(v):
			obj[k] = json.Number(v)
		case v == "":
			obj[k] = nil
		default:
			obj[k] = v
		}
	}
	return obj
}

func isNumber(s string) bool {
	_, err := strconv.ParseFloat(s, 64)
	return err == nil && s != "" && s != "NaN" && s != "Inf" && s != "+Inf" && s != "-Inf"
}
