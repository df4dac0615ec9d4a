// Command fifthbench measures fifthline's pitch detector against aubio's
// yin and yinfft on the same signals in the same run, and prints one table
// (also written to pitchdetect/BENCH.md).
//
// Signals are made in memory with known truth: synthetic tones, sox synth
// tones, FluidR3 SoundFont loops (exact k·R/L fundamentals), exact shifts
// of one loop, vibrato, noise, onsets and fluidsynth renders. Each is
// written once as a 32-bit float WAV for aubiopitch. It needs sox,
// aubio-tools, fluidsynth and fluid-soundfont-gm. It is a measurement, not a
// test: it checks no targets and exits 0 whatever the numbers; the table's
// last column states the targets.
package main

import (
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
)

func main() {
	md := flag.String("md", "pitchdetect/BENCH.md", "also write the table to this Markdown file (empty: don't)")
	keep := flag.Bool("keep", false, "keep the WAV files (their directory is printed)")
	verbose := flag.Bool("v", false, "list fifthline's gross errors and unvoiced frames per clip on stderr")
	flag.Parse()
	if err := run(os.Stdout, *md, *keep, *verbose); err != nil {
		fmt.Fprintln(os.Stderr, "fifthbench:", err)
		os.Exit(1)
	}
}

func run(w io.Writer, md string, keep, verbose bool) error {
	tools := map[string]string{}
	for _, t := range []string{"sox", "aubiopitch", "fluidsynth"} {
		p, err := exec.LookPath(t)
		if err != nil {
			return fmt.Errorf("%s not found (install sox, aubio-tools, fluidsynth)", t)
		}
		tools[t] = p
	}
	tmp, err := os.MkdirTemp("", "fifthbench-")
	if err != nil {
		return err
	}
	if keep {
		fmt.Fprintln(os.Stderr, "fifthbench: WAV files in", tmp)
	} else {
		defer os.RemoveAll(tmp)
	}
	clips, err := buildClips(tools["sox"], tools["fluidsynth"], tmp)
	if err != nil {
		return err
	}
	for i := range clips {
		clips[i].path = filepath.Join(tmp, fmt.Sprintf("clip%03d.wav", i))
		if err := writeWAV(clips[i].path, int(clips[i].rate), clips[i].x); err != nil {
			return err
		}
	}
	names := []string{"fifthline", "aubio yin", "aubio yinfft"}
	tallies := []*tally{newTally(), newTally(), newTally()}
	for _, c := range clips {
		r, err := runFifthline(c)
		if err != nil {
			return fmt.Errorf("%s: %w", c.name, err)
		}
		g, u := tallies[0].gross, tallies[0].unvoiced
		tallies[0].add(c, r, true)
		if verbose && (tallies[0].gross > g || tallies[0].unvoiced > u) {
			fmt.Fprintf(os.Stderr, "fifthbench: %s: %d gross, %d unvoiced\n", c.name, tallies[0].gross-g, tallies[0].unvoiced-u)
			for i, t := range r.t {
				if r.hz[i] > 0 && math.Abs(cents(r.hz[i], c.hz)) > 50 {
					fmt.Fprintf(os.Stderr, "fifthbench:   %.3f s: %.2f Hz, %+.0f ¢\n", t, r.hz[i], cents(r.hz[i], c.hz))
				}
			}
		}
		for j, m := range []string{"yin", "yinfft"} {
			r, err := runAubio(tools["aubiopitch"], m, c)
			if err != nil {
				return err
			}
			tallies[j+1].add(c, r, false)
		}
	}
	table := render(clips, names, tallies)
	fmt.Fprint(w, table)
	if md == "" {
		return nil
	}
	// Write beside the target and rename, so an interrupted run leaves the
	// previous table intact.
	part := md + ".part"
	if err := os.WriteFile(part, []byte(table), 0o644); err != nil {
		return err
	}
	return os.Rename(part, md)
}

func render(clips []clip, names []string, ts []*tally) string {
	count := map[kind]int{}
	for _, c := range clips {
		count[c.kind]++
	}
	var b strings.Builder
	fmt.Fprintf(&b, "Pitch detector benchmark (fifthbench): %d steady clips with exact truth, %d fluidsynth renders, "+
		"%d vibrato, %d interval pairs, %d noise, %d onsets, %d tones in noise; aubio run with fifthline's window and hop.\n\n",
		count[steady], count[rendered], count[vibrato], count[interval]/2, count[noise], count[onset], count[crb])
	fmt.Fprintf(&b, "| measure | %s | target |\n|---|%s---|\n", strings.Join(names, " | "), strings.Repeat("---|", len(names)))
	row := func(label, target string, cell func(t *tally) string) {
		cells := make([]string, len(ts))
		for i, t := range ts {
			cells[i] = cell(t)
		}
		fmt.Fprintf(&b, "| %s | %s | %s |\n", label, strings.Join(cells, " | "), target)
	}
	row("gross errors (>50 ¢), frames on tones", "0", func(t *tally) string {
		return fmt.Sprintf("%d of %d", t.gross, t.toneFrames-t.unvoiced)
	})
	row("unvoiced frames on tones", "—", func(t *tally) string {
		return f("%.1f %%", 100*float64(t.unvoiced)/float64(max(t.toneFrames, 1)))
	})
	for _, q := range []struct {
		label, target string
		q             float64
	}{{"steady abs. error median, ¢", "≤ 0.02", 0.5}, {"steady abs. error p90, ¢", "≤ 0.2", 0.9}, {"steady abs. error p99, ¢", "≤ 1", 0.99}} {
		row(q.label, q.target, func(t *tally) string { return f("%.4f", quantile(t.steadyErr, q.q)) })
	}
	row("vibrato centre abs. error median, ¢", "≤ 0.5", func(t *tally) string { return f("%.3f", quantile(t.vibErr, 0.5)) })
	row("interval of two exact shifts, abs. error median, ¢", "≤ 0.05", func(t *tally) string { return f("%.4f", quantile(t.intErr, 0.5)) })
	row("false pitches on noise/breath/silence, frames", "0", func(t *tally) string {
		return fmt.Sprintf("%d of %d", t.falsePitch, t.noiseFrames)
	})
	row("CPU seconds per second of audio, all clips", "≤ ½ aubio yin", func(t *tally) string { return f("%.4f", t.cpu.Seconds()/t.audio) })
	row("CPU seconds per second of audio, one 20 s clip at 44.1 kHz", "≤ ½ aubio yin", func(t *tally) string { return f("%.4f", t.longCPU) })
	row("spread / Cramér–Rao bound, median", "—", func(t *tally) string { return f("%.2f", quantile(t.crbRatio, 0.5)) })
	row("first reading after onset, median / max, ms", "≤ 60", func(t *tally) string {
		s := f("%.0f", 1000*quantile(t.firstRead, 0.5)) + " / " + f("%.0f", 1000*quantile(t.firstRead, 1))
		if t.missedOnsets > 0 {
			s += fmt.Sprintf(" (%d missed)", t.missedOnsets)
		}
		return s
	})
	b.WriteString("\nfifthline's CPU is its thread's time in Detector.Feed, fed hop by hop; aubio's is the aubiopitch process " +
		"(including reading the WAV). Vibrato centre: fifthline's Segmenter; aubio's frames averaged over whole cycles of the true rate. " +
		"Cramér–Rao bound for each detector's analysis length taken as fifthline's span (Kay 1993, eq. 3.41, summed over partials).\n")
	return b.String()
}
