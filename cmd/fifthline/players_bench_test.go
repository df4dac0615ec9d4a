package main

import (
	"flag"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"fifthline/internal/vmic"
)

// Four players live: `listen --players` on a 4-channel virtual interface (a
// PulseAudio null sink of four channels, each player's channel carrying the
// others 20 dB down and 3 ms late), side by side with the one-player
// figures of BenchmarkListenPlainLive; cpu_%core and rss_MB are measured
// the same way.
//
//	go test -run XXX -bench ListenPlayersPlainLive -benchtime 1x ./cmd/fifthline/
//
// onset→reading: from the moment a note's first samples reached the
// input's converter (found in the captured channel: the 2.7 ms chunk where
// its rise above -24 dBFS after quiet began, timing.go; timed by
// PortAudio's inputBufferAdcTime) to the moment the first frame of that
// player's channel read at the note's pitch (within 50 ¢) was written, on
// PortAudio's stream clock, as FIFTHLINE_TIMING logs them. Beside it, the old upper bound (from paplay's
// start plus the note's offset in the file, so PulseAudio's playback
// start-up included) and detection (first loud frame → first reading).
func BenchmarkListenPlayersPlainLive(b *testing.B) {
	for range b.N {
		measurePlayersLive(b, false)
	}
}

// BenchmarkAnalyzePlayers is the whole command on one core: `analyze
// --players` (which reads the first minute twice, learning the bleed first)
// on five minutes of the quartet's cycle, a 4-channel 24-bit 48 kHz WAV, with GOMAXPROCS=1.
// x-realtime is seconds of audio per second of the clock, x-realtime-cpu
// per second of the process's CPU time (unaffected by other work on the
// machine). Every note must be read.
func BenchmarkAnalyzePlayers(b *testing.B) {
	const cycles = 75
	take := quartetCycleWAV(b, cycles)
	bin := fifthlineBinary(b)
	b.ResetTimer()
	cpu := 0.0
	for range b.N {
		cmd := exec.Command(bin, "analyze", "--players", cyclePlayers, take)
		cmd.Env = append(os.Environ(), "GOMAXPROCS=1")
		out, err := cmd.Output()
		if err != nil {
			b.Fatalf("analyze --players: %v", err)
		}
		cpu += (cmd.ProcessState.UserTime() + cmd.ProcessState.SystemTime()).Seconds()
		if rows := strings.Count(string(out), "\n") - 1; rows != cycles*len(quartetCycle) {
			b.Errorf("%d notes read, %d played", rows, cycles*len(quartetCycle))
		}
	}
	audio := cycles * cycleSeconds * float64(b.N)
	b.ReportMetric(audio/b.Elapsed().Seconds(), "x-realtime")
	b.ReportMetric(audio/cpu, "x-realtime-cpu")
}

// BenchmarkListenPlayersMeterLive is the same take with the group meter on
// screen (`listen --players` in an 80×24 tmux window): CPU and memory (the
// meter logs no frames, so onset→reading is the plain variant's).
func BenchmarkListenPlayersMeterLive(b *testing.B) {
	for range b.N {
		measurePlayersLive(b, true)
	}
}

// soakLength is how long BenchmarkListenPlayersSoak plays:
//
//	go test -run XXX -bench ListenPlayersSoak -benchtime 1x -timeout 2h ./cmd/fifthline/ -soak 1h
var soakLength = flag.Duration("soak", 3*time.Minute, "how long BenchmarkListenPlayersSoak plays continuous 4-channel input")

// BenchmarkListenPlayersSoak plays the quartet's cycle without a break for
// -soak into `listen --plain --players --log`, samples the process's CPU
// and resident memory every minute (both should stay flat), and checks the
// journal against the notes sent: every player's every note, spelled.
func BenchmarkListenPlayersSoak(b *testing.B) {
	for range b.N {
		soakPlayers(b, *soakLength, false)
	}
}

// BenchmarkListenPlayersMeterSoak is the soak with the group meter on
// screen.
func BenchmarkListenPlayersMeterSoak(b *testing.B) {
	for range b.N {
		soakPlayers(b, *soakLength, true)
	}
}

// cycleNote is one note of the benchmark's quartet cycle.
type cycleNote struct {
	player     int
	note       string
	hz         float64
	start, end float64 // seconds into the cycle
}

// The cycle, a cadence of our own: C major then G major, equal temperament
// at A4 = 440 Hz (ISO 16). Each player enters at a moment of their own, so
// every onset is timed on one channel.
const (
	cycleSeconds = 4.0
	cyclePlayers = "vc,vla,vl2,vl1"
)

var quartetCycle = []cycleNote{
	{0, "C3", 130.8128, 0.20, 1.70}, {0, "G2", 97.9989, 2.00, 3.60},
	{1, "G3", 195.9977, 0.45, 3.60},
	{2, "E4", 329.6276, 0.70, 1.70}, {2, "D4", 293.6648, 2.25, 3.60},
	{3, "C5", 523.2511, 0.95, 1.70}, {3, "B4", 493.8833, 2.50, 3.60},
}

// quartetCycleWAV renders the cycle repeated cycles times: sox sawtooth
// notes, one player per channel, mixed with the others' bleed (soxBleed).
func quartetCycleWAV(b *testing.B, cycles int) string {
	dir := b.TempDir()
	f := func(x float64) string { return strconv.FormatFloat(x, 'f', 4, 64) }
	var dry []string
	for p := range strings.Split(cyclePlayers, ",") {
		mix := []string{"-m"}
		for i, n := range quartetCycle {
			if n.player != p {
				continue
			}
			w := filepath.Join(dir, fmt.Sprintf("note%d.wav", i))
			soxTB(b, "-n", "-r", "48000", "-b", "24", w, "synth", f(n.end-n.start), "sawtooth", f(n.hz),
				"fade", "0.02", f(n.end-n.start), "0.02", "vol", "0.25", "pad", f(n.start), f(cycleSeconds-n.end))
			mix = append(mix, "-v", "1", w)
		}
		part := filepath.Join(dir, fmt.Sprintf("part%d.wav", p))
		if len(mix) == 4 { // one note: nothing to mix
			mix = mix[3:]
		}
		soxTB(b, append(mix, part)...)
		dry = append(dry, part)
	}
	mixed, cycle := filepath.Join(dir, "mixed.wav"), filepath.Join(dir, "cycle.wav")
	soxBleed(b, dir, dry, mixed)
	soxTB(b, mixed, cycle, "trim", "0", f(cycleSeconds)) // the bleed's 3 ms tail is silence
	if cycles == 1 {
		return cycle
	}
	take := filepath.Join(dir, "take.wav")
	soxTB(b, cycle, take, "repeat", strconv.Itoa(cycles-1))
	return take
}

// fourChannels is the virtual interface's channel map, one per player.
var fourChannels = []string{"front-left", "front-right", "rear-left", "rear-right"}

// playersListener is `listen --players` running on the virtual interface:
// with --plain (its stdout in a file), or as the meter in tmux.
type playersListener struct {
	pid  int
	stop func() // interrupt it (q for the meter) and wait for it to end
}

func startPlayersListener(b *testing.B, meter bool, env []string, args ...string) playersListener {
	args = append([]string{"listen", "--players", cyclePlayers}, args...)
	if meter {
		m := startTmux(b, 80, 24, env, args...)
		m.waitFor(`vc`)
		return playersListener{meterPid(b, m), func() {
			m.quit()
		}}
	}
	out := filepath.Join(b.TempDir(), "stdout.csv")
	f, err := os.Create(out)
	if err != nil {
		b.Fatal(err)
	}
	cmd := exec.Command(fifthlineBinary(b), append(args, "--plain")...)
	cmd.Env, cmd.Stdout = append(os.Environ(), env...), f
	if err := cmd.Start(); err != nil {
		b.Fatal(err)
	}
	f.Close()
	b.Cleanup(func() { _ = cmd.Process.Kill(); _ = cmd.Wait() })
	// The header comes once the interface is open.
	for deadline := time.Now().Add(hangPatience); ; time.Sleep(50 * time.Millisecond) {
		if text, _ := os.ReadFile(out); strings.Contains(string(text), "\n") {
			break
		}
		if time.Now().After(deadline) {
			b.Fatalf("listen --players wrote no header in %v", hangPatience)
		}
	}
	return playersListener{cmd.Process.Pid, func() {
		_ = cmd.Process.Signal(os.Interrupt)
		_ = cmd.Wait()
	}}
}

// playersLeadIn is the silence played before the take.
const playersLeadIn = 1500 * time.Millisecond

func measurePlayersLive(b *testing.B, meter bool) {
	const cycles = 5
	mic := vmic.IsolateChannels(b, fourChannels...)
	take := quartetCycleWAV(b, cycles)
	// The take is played after playersLeadIn of silence: for about a second
	// after playback into the sink starts, the converter times run up to
	// 0.7 s early (measured: the first cycle's first notes in 7 of 19 runs
	// without it, while paplay's start → reading stayed ≤ 100 ms; in none
	// of 8 with it).
	played := filepath.Join(b.TempDir(), "played.wav")
	soxTB(b, take, played, "pad", strconv.FormatFloat(playersLeadIn.Seconds(), 'f', 3, 64))
	timing := filepath.Join(b.TempDir(), "timing.csv")
	l := startPlayersListener(b, meter, append(mic.Env(), "FIFTHLINE_TIMING="+timing))
	// The stream settles: through the ALSA pulse plugin its first second's
	// converter times run up to 0.6 s early (measured; device.ADCTime).
	time.Sleep(2 * time.Second)
	started := time.Now().Add(playersLeadIn)
	reportCost(b, l.pid, func() {
		if err := mic.PlayChannels(played)(); err != nil {
			b.Fatal(err)
		}
	})
	time.Sleep(700 * time.Millisecond) // the last notes' release reaches the input
	l.stop()
	if meter {
		return // the meter logs no frames
	}
	lat := playerLatencies(b, timing, started, cycles)
	b.Logf("onset at the input→reading per note, ms: %.0f", lat.input)
	b.Logf("paplay's start→reading (upper bound) per note, ms: %.0f", lat.played)
	b.Logf("of which detection (first loud frame → first reading), ms: %.0f", lat.detection)
	// The first cycle is reported apart: the listener's first notes, and
	// where the converter times ran early before playersLeadIn.
	settled := lat.input[len(quartetCycle):]
	b.ReportMetric(median(settled), "onset→reading_ms")
	b.ReportMetric(slices.Max(settled), "onset→reading_max_ms")
	b.ReportMetric(slices.Max(lat.input[:len(quartetCycle)]), "onset→reading_cycle1_max_ms")
	// The first cycle, where the converter times may run early, timed
	// without them: from paplay's start (an upper bound, playback's
	// start-up included), and fifthline's own part, from finding the
	// onset in its input.
	b.ReportMetric(slices.Max(lat.played[:len(quartetCycle)]), "played→reading_cycle1_max_ms")
	b.ReportMetric(slices.Max(lat.own[:len(quartetCycle)]), "found→reading_cycle1_max_ms")
	b.ReportMetric(slices.Max(lat.own), "found→reading_max_ms")
	b.ReportMetric(slices.Min(lat.windowEnd[len(quartetCycle):]), "window_end→reading_min_ms")
	b.ReportMetric(median(lat.played), "played→reading_ms")
	b.ReportMetric(slices.Max(lat.played), "played→reading_max_ms")
	b.ReportMetric(median(lat.detection), "detection_ms")
	b.ReportMetric(slices.Max(lat.detection), "detection_max_ms")
	reportLoad(b)
}

// reportLoad puts the machine's load beside the figures: other work on the
// cores delays the readings.
func reportLoad(b *testing.B) {
	if load, err := os.ReadFile("/proc/loadavg"); err == nil {
		if f := strings.Fields(string(load)); len(f) > 0 {
			b.ReportMetric(parseNum(f[0]), "load_avg")
		}
	}
}

// parseNum is s as a number, 0 if it is none.
func parseNum(s string) float64 {
	x, _ := strconv.ParseFloat(s, 64)
	return x
}

// noteLatencies are each note's delays in ms, in the take's order: from its
// onset at the input (on PortAudio's clock), from paplay's start plus its
// offset in the take (an upper bound), and from its first loud frame.
type noteLatencies struct {
	input, played, detection []float64
	// windowEnd is from when the reading's window's last sample reached
	// the converter, on the same clock: no reading comes before its last
	// sample, so a negative figure says the converter times run late.
	windowEnd []float64
	// own is from when fifthline found the onset in the samples it read
	// to the reading, on the wall clock: the part of input that is its
	// own, whatever the converter times say.
	own []float64
}

// halfWindow is how far past its frame's time (the window's centre) a
// reading's window reaches: half the detector's 4096-sample window at
// 48 kHz (pitchdetect.New's default).
const halfWindow = 2048.0 / 48000

// playerLatencies follows each player's frames through their notes in
// order: every note is preceded by at least 0.3 s in which the channel is
// quieter than -30 dBFS (the notes sound at -17 dBFS, the others' bleed at
// -35 dBFS or less), then comes its first loud frame, then the first frame
// read within 50 ¢ of it. Its onset at the input is the player's last onset
// row (found in the captured samples) at or before that reading's frame.
func playerLatencies(b *testing.B, path string, played time.Time, cycles int) noteLatencies {
	recs := timingRows(b, path)
	type frame struct {
		wall         time.Time
		t, hz, level float64 // t: the frame's time in the stream, s
		voiced       bool
		clock        float64 // PortAudio's stream clock when written (voiced frames)
	}
	type onset struct {
		t, adc float64   // stream time; on PortAudio's clock
		found  time.Time // when fifthline found it in the samples it read
	}
	names := strings.Split(cyclePlayers, ",")
	frames := make([][]frame, len(names))
	onsets := make([][]onset, len(names))
	for _, r := range recs {
		p := slices.Index(names, r[7])
		if p < 0 {
			continue
		}
		if r[9] != "" {
			ns, _ := strconv.ParseInt(r[0], 10, 64)
			onsets[p] = append(onsets[p], onset{parseNum(r[1]), parseNum(r[9]), time.Unix(0, ns)})
			continue
		}
		ns, _ := strconv.ParseInt(r[0], 10, 64)
		frames[p] = append(frames[p], frame{time.Unix(0, ns), parseNum(r[1]), parseNum(r[2]), parseNum(r[3]), r[4] == "true", parseNum(r[8])})
	}
	ms := func(d time.Duration) float64 { return float64(d) / float64(time.Millisecond) }
	// lag is how far behind its place in the stream a frame left the
	// pipeline, give or take a constant.
	lag := func(f frame) time.Duration {
		return f.wall.Sub(time.Unix(0, 0)) - time.Duration(f.t*float64(time.Second))
	}
	quickest := time.Duration(math.MaxInt64)
	for _, fs := range frames {
		for _, f := range fs {
			quickest = min(quickest, lag(f))
		}
	}
	var lat noteLatencies
	next := make([]int, len(names)) // each player's next frame to look at
	for k := range cycles {
		for _, n := range quartetCycle {
			start := played.Add(time.Duration((float64(k)*cycleSeconds + n.start) * float64(time.Second)))
			fs, i := frames[n.player], next[n.player]
			for i < len(fs) && fs[i].level > -30 { // the previous note's end
				i++
			}
			for i < len(fs) && fs[i].level <= -30 { // the silence before
				i++
			}
			loud := i
			for i < len(fs) && !(fs[i].voiced && math.Abs(1200*math.Log2(fs[i].hz/n.hz)) <= 50) {
				i++
			}
			if i == len(fs) {
				b.Fatalf("cycle %d: %s's %s never read", k+1, names[n.player], n.note)
			}
			next[n.player] = i
			// The frame's window ends after its time; its note began at
			// most a window (85 ms) later, and earlier than the last rest.
			j := slices.IndexFunc(onsets[n.player], func(o onset) bool { return o.t > fs[i].t+0.1 })
			if j < 0 {
				j = len(onsets[n.player])
			}
			if j == 0 || onsets[n.player][j-1].t < fs[loud].t-0.3 {
				b.Fatalf("cycle %d: no onset found at the input for %s's %s (read at %.3f s in the stream)", k+1, names[n.player], n.note, fs[i].t)
			}
			at := onsets[n.player][j-1]
			lat.input = append(lat.input, 1000*(fs[i].clock-at.adc))
			lat.windowEnd = append(lat.windowEnd, 1000*(fs[i].clock-(at.adc+fs[i].t+halfWindow-at.t)))
			lat.played = append(lat.played, ms(fs[i].wall.Sub(start)))
			lat.detection = append(lat.detection, ms(fs[i].wall.Sub(fs[loud].wall)))
			// onset→reading split where fifthline found the onset in
			// the samples it read: before, the wait the converter time
			// claims (the input's buffering); after, fifthline's own.
			own := ms(fs[i].wall.Sub(at.found))
			lat.own = append(lat.own, own)
			// Per note: voiced is stream time from the onset found in the
			// samples to the first frame read at the pitch; held how much
			// later than the quickest frame of the take that frame left the
			// pipeline (held back at an onset, attack.go, or waiting for
			// another player's).
			b.Logf("cycle %d %s %s: onset at the input→reading %.0f ms (paplay→reading %.0f ms; converter→found %.0f ms, found→reading %.0f ms), onset→voiced frame %.0f ms, held %.0f ms",
				k+1, names[n.player], n.note, lat.input[len(lat.input)-1], lat.played[len(lat.played)-1],
				lat.input[len(lat.input)-1]-own, own, 1000*(fs[i].t-at.t), ms(lag(fs[i])-quickest))
		}
	}
	return lat
}
