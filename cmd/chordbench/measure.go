package main

import (
	"bufio"
	"bytes"
	"fmt"
	"math"
	"os/exec"
	"slices"
	"strconv"
	"strings"
	"syscall"
	"time"

	"fifthline/internal/testsignal"
	"fifthline/multipitch"
	"fifthline/pitchdetect"
)

const tableHead = "| mixture | voices | median ¢ | worst ¢ | phantoms | missed | spread ¢ (CRB ¢) | one-pitch detector: voices found, median ¢ | aubio yinfft: voices found, median ¢ | × real time | first reading ms (worst of 4 onset phases) |\n" +
	"|---|---|---|---|---|---|---|---|---|---|---|\n"

const tableFoot = "\nTargets (issue 14): every voice found, median ≤ 0.5 ¢, every voice within 2 ¢ (3 ¢ with vibrato), phantoms ≤ 10 %, offline ≥ 5× real time on one core; first chord reading ≤ 300 ms after the chord starts. " +
	"Frames are scored whose window lies wholly in the take; a voice with vibrato is scored by its mean over the take against its centre. " +
	"Spread is the standard deviation of the steady voices' frame errors; the CRB is the largest voice's bound over one window with all voices estimated together " +
	"(testsignal.CramerRaoChordHz: the joint model's Fisher information, so coinciding partials raise it; 30 partials a voice). " +
	"The one-pitch detectors hear one pitch per moment: 'voices found' counts the chord's voices they report in at least a tenth of the frames.\n"

// measure runs the three detectors on one mixture and formats its row.
func measure(m mixture, wav string) (string, error) {
	est, err := multipitch.New(rate, 0, 0, multipitch.Config{})
	if err != nil {
		return "", err
	}
	var errs, steady []float64
	means := make([]float64, len(m.voices))
	counts := make([]int, len(m.voices))
	var phantoms, missed, reported, frames int
	// The take follows lead seconds of silence, as a chord follows a
	// breath.
	block := append(make([]float32, int(lead*rate)), testsignal.Float32(m.x)...)
	t0 := cpu()
	est.Feed(block, func(f multipitch.Frame) {
		if f.Time-f.Span/2 < lead || f.Time+f.Span/2 > lead+seconds {
			return
		}
		frames++
		reported += len(f.Voices)
		used := make([]bool, len(f.Voices))
		for i, v := range m.voices {
			j := nearest(f.Voices, used, v.hz)
			if j < 0 {
				missed++
				continue
			}
			used[j] = true
			c := testsignal.Cents(f.Voices[j].Hz, v.hz)
			means[i] += c
			counts[i]++
			if !v.vibrato {
				errs = append(errs, math.Abs(c))
				steady = append(steady, c)
			}
		}
		for _, u := range used {
			if !u {
				phantoms++
			}
		}
	})
	spent := cpu() - t0
	for i, v := range m.voices {
		if v.vibrato && counts[i] > 0 {
			errs = append(errs, math.Abs(means[i]/float64(counts[i])))
		}
	}
	cv := make([]testsignal.ChordVoice, len(m.voices))
	for i, v := range m.voices {
		cv[i] = testsignal.ChordVoice{Hz: v.hz, Amps: v.amps}
	}
	crb := 0.0
	for i, hz := range testsignal.CramerRaoChordHz(rate, est.Window(), cv, m.sigma) {
		crb = math.Max(crb, 1200/math.Ln2*hz/m.voices[i].hz)
	}
	first, err := firstReading(m)
	if err != nil {
		return "", err
	}
	one, err := oneDetector(m)
	if err != nil {
		return "", err
	}
	aub, err := aubio(m, wav)
	if err != nil {
		return "", err
	}
	slices.Sort(errs)
	med, worst := math.NaN(), math.NaN()
	if len(errs) > 0 {
		med, worst = errs[len(errs)/2], errs[len(errs)-1]
	}
	return fmt.Sprintf("| %s | %d | %.4f | %.4f | %s | %s | %.4f (%.4f) | %s | %s | %.1f | %.0f |\n",
		m.name, len(m.voices), med, worst, pct(phantoms, reported), pct(missed, frames*len(m.voices)),
		stdDev(steady), crb, one, aub, seconds/spent.Seconds(), 1000*first), nil // the silence costs little: not counted as audio read
}

// lead is the silence before each take.
const lead = 0.5

// firstReading is how long after the chord's onset the first frame that
// holds every voice ends, the worst of four onsets a quarter hop apart
// (where an onset falls between two frames decides how much of a window
// the next one holds of it).
func firstReading(m mixture) (float64, error) {
	worst := 0.0
	for phase := range 4 {
		est, err := multipitch.New(rate, 0, 0, multipitch.Config{})
		if err != nil {
			return 0, err
		}
		start := lead + float64(phase*est.Hop()/4)/rate
		block := append(make([]float32, int(start*rate)), testsignal.Float32(m.x[:int(rate)])...)
		first := math.NaN()
		est.Feed(block, func(f multipitch.Frame) {
			if math.IsNaN(first) && allFound(f.Voices, m.voices) {
				first = f.Time + f.Span/2 - start
			}
		})
		if math.IsNaN(first) { // never found: no reading at all
			return first, nil
		}
		worst = math.Max(worst, first)
	}
	return worst, nil
}

func allFound(vs []multipitch.Voice, truth []voice) bool {
	used := make([]bool, len(vs))
	for _, v := range truth {
		j := nearest(vs, used, v.hz)
		if j < 0 {
			return false
		}
		used[j] = true
	}
	return true
}

func nearest(vs []multipitch.Voice, used []bool, hz float64) int {
	best, bc := -1, 50.0
	for j, v := range vs {
		if c := math.Abs(testsignal.Cents(v.Hz, hz)); !used[j] && c < bc {
			best, bc = j, c
		}
	}
	return best
}

func pct(a, b int) string {
	if b == 0 {
		return "–"
	}
	return fmt.Sprintf("%.0f %%", 100*float64(a)/float64(b))
}

func stdDev(x []float64) float64 {
	if len(x) == 0 {
		return math.NaN()
	}
	var m, s float64
	for _, v := range x {
		m += v / float64(len(x))
	}
	for _, v := range x {
		s += (v - m) * (v - m)
	}
	return math.Sqrt(s / float64(len(x)))
}

// cpu is the process's user+system CPU time.
func cpu() time.Duration {
	var ru syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &ru)
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// found summarises a one-pitch track against the chord: how many of its
// voices appear in at least a tenth of the frames, and the median error of
// the frames that hit any voice.
func found(m mixture, hz []float64) string {
	hits := make([]int, len(m.voices))
	var errs []float64
	for _, f := range hz {
		for i, v := range m.voices {
			if c := testsignal.Cents(f, v.hz); f > 0 && math.Abs(c) < 50 {
				hits[i]++
				errs = append(errs, math.Abs(c))
				break
			}
		}
	}
	n := 0
	for _, h := range hits {
		if 10*h >= len(hz) {
			n++
		}
	}
	if len(errs) == 0 {
		return fmt.Sprintf("%d of %d", n, len(m.voices))
	}
	slices.Sort(errs)
	return fmt.Sprintf("%d of %d, %.3f", n, len(m.voices), errs[len(errs)/2])
}

// oneDetector runs fifthline's single-voice detector over the mixture.
func oneDetector(m mixture) (string, error) {
	d, err := pitchdetect.New(rate, 0, 0)
	if err != nil {
		return "", err
	}
	var hz []float64
	for _, e := range d.Feed(testsignal.Float32(m.x), nil) {
		hz = append(hz, e.Hz)
	}
	return found(m, hz), nil
}

// aubio writes the mixture as a 32-bit float WAV through sox and reads
// aubiopitch's track (its default buffer and hop).
func aubio(m mixture, wav string) (string, error) {
	var raw bytes.Buffer
	for _, v := range testsignal.Float32(m.x) {
		b := math.Float32bits(v)
		raw.Write([]byte{byte(b), byte(b >> 8), byte(b >> 16), byte(b >> 24)})
	}
	sox := exec.Command("sox", "-t", "raw", "-e", "floating-point", "-b", "32", "-L", "-r", strconv.Itoa(int(rate)), "-c", "1", "-", "-e", "floating-point", wav)
	sox.Stdin = &raw
	if out, err := sox.CombinedOutput(); err != nil {
		return "", fmt.Errorf("sox: %v: %s", err, out)
	}
	out, err := exec.Command("aubiopitch", "-i", wav, "-p", "yinfft").Output()
	if err != nil {
		return "", fmt.Errorf("aubiopitch (Debian aubio-tools): %v", err)
	}
	var hz []float64
	sc := bufio.NewScanner(bytes.NewReader(out))
	for sc.Scan() {
		f := strings.Fields(sc.Text())
		if len(f) != 2 {
			continue
		}
		if v, err := strconv.ParseFloat(f[1], 64); err == nil {
			hz = append(hz, v)
		}
	}
	return found(m, hz), nil
}
