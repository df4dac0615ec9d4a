package main

import (
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
)

// Live cost and latency of `listen --plain` at 48 kHz through a virtual
// microphone: one session per run, tones playing throughout.
//
//	go test -run XXX -bench ListenPlainLive ./cmd/fifthline/
//
// cpu_%core: user+system time of the process over the measured span, as a
// share of one core (from /proc/PID/stat). rss_MB: the largest VmRSS seen.
// onset→reading: from the moment a tone starts at the virtual microphone
// (paplay's start plus the tone's offset in the file; paplay's own start-up
// is included, so this is an upper bound) to the first frame of the note
// leaving the pipeline, as FIFTHLINE_TIMING logs it. It is split into
// transport (to the first frame whose level shows the tone) and detection
// (from there to the first frame holding the note).
func BenchmarkListenPlainLive(b *testing.B) {
	for range b.N {
		measureListen(b)
	}
}

const (
	benchTones = 10  // tones per session
	benchTone  = 1.5 // seconds each
	benchGap   = 0.5 // seconds of silence before each
)

func measureListen(b *testing.B) {
	_, env, play := privateMic(b)
	wav := benchTonesWAV(b)
	timing := filepath.Join(b.TempDir(), "timing.csv")
	cmd := exec.Command(fifthlineBinary(b), "listen", "--plain", "--duration", "40s")
	cmd.Env = append(append(os.Environ(), env...), "FIFTHLINE_TIMING="+timing)
	if err := cmd.Start(); err != nil {
		b.Fatal(err)
	}
	defer func() { _ = cmd.Process.Kill(); _ = cmd.Wait() }()
	// Wait for the stream to deliver: the timing log's first frames.
	waitForTiming(b, timing, "\n", 3, "listen delivered no frames")
	started := time.Now()
	reportCost(b, cmd.Process.Pid, func() { play(wav) })
	_ = cmd.Process.Signal(os.Interrupt)
	_ = cmd.Wait()
	transport, detection, total := onsetLatencies(b, timing, started)
	b.Logf("onset→reading per tone, ms: %.0f", total)
	b.Logf("of which detection (first loud frame → first held frame), ms: %.0f", detection)
	b.ReportMetric(median(total), "onset→reading_ms")
	b.ReportMetric(slices.Max(total), "onset→reading_max_ms")
	b.ReportMetric(median(transport), "transport_ms")
	b.ReportMetric(median(detection), "detection_ms")
	b.ReportMetric(slices.Max(detection), "detection_max_ms")
}

// benchTonesWAV writes the benchmarks' tones: equal-tempered C4 … E5 at
// A4 = 440 Hz (ISO 16), each after a gap of silence, 48 kHz mono.
func benchTonesWAV(b *testing.B) string {
	var parts []string
	dir := b.TempDir()
	for i := range benchTones {
		hz := 440 * math.Exp2(float64(i*2-9)/12)
		p := filepath.Join(dir, fmt.Sprintf("t%d.wav", i))
		soxTB(b, "-n", "-r", "48000", "-c", "1", "-b", "16", p, "synth", fmt.Sprint(benchTone), "sine", strconv.FormatFloat(hz, 'f', 4, 64), "gain", "-12", "pad", fmt.Sprint(benchGap), "0")
		parts = append(parts, p)
	}
	wav := filepath.Join(dir, "tones.wav")
	soxTB(b, append(parts, wav)...)
	return wav
}

// The meter on screen while the same tones play: `listen` in an 80×24 tmux
// window, the way a player runs it.
//
//	go test -run XXX -bench ListenMeterLive ./cmd/fifthline/
func BenchmarkListenMeterLive(b *testing.B) { measureMeter(b, false) }

// The same with the meter's drone sounding (the d key) into the virtual
// microphone it listens to, so the canceller works throughout: a player
// practising against a drone.
//
//	go test -run XXX -bench ListenMeterDroneLive ./cmd/fifthline/
func BenchmarkListenMeterDroneLive(b *testing.B) { measureMeter(b, true) }

func measureMeter(b *testing.B, withDrone bool) {
	for range b.N {
		sink, env, play := privateMic(b)
		wav := benchTonesWAV(b)
		m := startTmux(b, 80, 24, append(env, "PULSE_SINK="+sink), "listen")
		m.waitFor(`input .*dB`)
		if withDrone {
			m.tmux("send-keys", "-t", "meter", "d")
			m.waitFor(`drone: C\d at`)
			time.Sleep(time.Second) // past its fade in
		}
		reportCost(b, meterPid(b, m), func() { play(wav) })
		m.quit()
	}
}

// onsetLatencies reads the timing log and finds, for each tone, the first
// loud frame and the first frame holding a note after the tone's onset.
func onsetLatencies(b *testing.B, path string, played time.Time) (transport, detection, total []float64) {
	recs := timingRows(b, path)
	type fr struct {
		wall           time.Time
		level          float64
		holding, quiet bool
	}
	var frames []fr
	for _, r := range recs {
		ns, _ := strconv.ParseInt(r[0], 10, 64)
		lvl, _ := strconv.ParseFloat(r[3], 64)
		frames = append(frames, fr{wall: time.Unix(0, ns), level: lvl, holding: r[5] == "true"})
	}
	for i := range benchTones {
		onset := played.Add(time.Duration((float64(i)*(benchTone+benchGap) + benchGap) * float64(time.Second)))
		var loud, held time.Time
		for _, x := range frames {
			// Frames from the previous tone's tail are skipped: look from a
			// little after the gap began.
			if x.wall.Before(onset.Add(-time.Duration(benchGap * float64(time.Second) / 2))) {
				continue
			}
			if loud.IsZero() && x.level > -40 {
				loud = x.wall
			}
			if !loud.IsZero() && x.holding {
				held = x.wall
				break
			}
		}
		if held.IsZero() {
			b.Fatalf("tone %d: no held frame", i)
		}
		ms := func(d time.Duration) float64 { return float64(d) / float64(time.Millisecond) }
		transport = append(transport, ms(loud.Sub(onset)))
		detection = append(detection, ms(held.Sub(loud)))
		total = append(total, ms(held.Sub(onset)))
	}
	return transport, detection, total
}

func median(x []float64) float64 {
	s := slices.Clone(x)
	slices.Sort(s)
	return s[len(s)/2]
}

// cpuSeconds is the process's user+system CPU time (/proc/PID/stat fields
// 14 and 15, in clock ticks of 1/100 s, the Linux USER_HZ).
// reportCost runs work while sampling process pid, and reports pid's CPU
// over that span as a share of one core and its largest resident memory.
func reportCost(b *testing.B, pid int, work func()) {
	cpu0, wall0 := cpuSeconds(b, pid), time.Now()
	rss := 0.0
	done := make(chan struct{})
	go func() { work(); close(done) }()
	for waiting := true; waiting; {
		select {
		case <-done:
			waiting = false
		case <-time.After(250 * time.Millisecond):
		}
		rss = max(rss, rssMB(b, pid))
	}
	b.ReportMetric(100*(cpuSeconds(b, pid)-cpu0)/time.Since(wall0).Seconds(), "cpu_%core")
	b.ReportMetric(rss, "rss_MB")
}

func cpuSeconds(b *testing.B, pid int) float64 {
	data, err := os.ReadFile(fmt.Sprintf("/proc/%d/stat", pid))
	if err != nil {
		b.Fatal(err)
	}
	// The command name may hold spaces; fields count from after its ')'.
	f := strings.Fields(string(data[strings.LastIndexByte(string(data), ')')+2:]))
	u, _ := strconv.ParseFloat(f[11], 64)
	s, _ := strconv.ParseFloat(f[12], 64)
	return (u + s) / 100
}

// rssMB is the process's resident memory (VmRSS in /proc/PID/status).
func rssMB(b *testing.B, pid int) float64 {
	data, err := os.ReadFile(fmt.Sprintf("/proc/%d/status", pid))
	if err != nil {
		return 0 // ended
	}
	for _, l := range strings.Split(string(data), "\n") {
		if rest, ok := strings.CutPrefix(l, "VmRSS:"); ok {
			kb, _ := strconv.ParseFloat(strings.TrimSuffix(strings.TrimSpace(rest), " kB"), 64)
			return kb / 1024
		}
	}
	return 0
}

func soxTB(b testing.TB, args ...string) {
	b.Helper()
	if out, err := exec.Command("sox", args...).CombinedOutput(); err != nil {
		b.Fatalf("sox %v: %v\n%s", args, err, out)
	}
}
