package main

import (
	"encoding/csv"
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

// soakPlayers streams the cycle without a break (sox's repeat into pacat,
// whose channel map is the sink's, so nothing is remixed) for length; args
// are listen's further flags.
func soakPlayers(b *testing.B, length time.Duration, meter bool, args ...string) {
	cycles := int(math.Ceil(length.Seconds() / cycleSeconds))
	mic := vmic.IsolateChannels(b, fourChannels...)
	cycle := quartetCycleWAV(b, 1)
	journal := filepath.Join(b.TempDir(), "journal.csv")
	l := startPlayersListener(b, meter, mic.Env(),
		append(args, "--log", journal, "--duration", (length+5*time.Minute).String())...)
	time.Sleep(500 * time.Millisecond)
	src := exec.Command("sox", cycle, "-t", "raw", "-e", "signed-integer", "-b", "16", "-", "repeat", strconv.Itoa(cycles-1))
	sink := exec.Command("pacat", "--playback", "--device="+mic.Sink, "--raw", "--format=s16le", "--rate=48000",
		"--channels=4", "--channel-map="+strings.Join(fourChannels, ","))
	pipe, err := src.StdoutPipe()
	if err != nil {
		b.Fatal(err)
	}
	sink.Stdin = pipe
	if err := sink.Start(); err != nil {
		b.Fatalf("pacat: %v", err)
	}
	if err := src.Start(); err != nil {
		b.Fatalf("sox: %v", err)
	}
	b.Cleanup(func() { _ = src.Process.Kill(); _ = sink.Process.Kill() })
	done := make(chan error, 1)
	go func() { _ = src.Wait(); done <- sink.Wait() }()

	// Every minute: the CPU share since the last sample and the resident
	// memory now.
	cpu0, wall0 := cpuSeconds(b, l.pid), time.Now()
	var cpu, rss []float64
	tick := time.NewTicker(time.Minute)
	defer tick.Stop()
	for playing := true; playing; {
		select {
		case err := <-done:
			if err != nil {
				b.Fatalf("pacat: %v", err)
			}
			playing = false
		case <-tick.C:
			c, w := cpuSeconds(b, l.pid), time.Now()
			cpu, rss = append(cpu, 100*(c-cpu0)/w.Sub(wall0).Seconds()), append(rss, rssMB(b, l.pid))
			cpu0, wall0 = c, w
			b.Logf("minute %d: %.1f %% of a core, %.1f MB resident", len(cpu), cpu[len(cpu)-1], rss[len(rss)-1])
		}
	}
	time.Sleep(time.Second) // the last notes' release reaches the input
	l.stop()
	if len(cpu) > 0 {
		b.ReportMetric(cpu[0], "cpu_first_min_%core")
		b.ReportMetric(cpu[len(cpu)-1], "cpu_last_min_%core")
		b.ReportMetric(rss[0], "rss_first_min_MB")
		b.ReportMetric(rss[len(rss)-1], "rss_last_min_MB")
		b.ReportMetric(slices.Max(rss), "rss_max_MB")
	}
	missing, extra, memberships := checkSoakJournal(b, journal, cycles)
	if slices.Contains(args, "--chords") {
		b.ReportMetric(float64(memberships), "chord_rows")
	}
	b.ReportMetric(float64(cycles*len(quartetCycle)), "notes_sent")
	b.ReportMetric(float64(missing), "notes_missing")
	b.ReportMetric(float64(extra), "notes_extra")
}

// checkSoakJournal compares each player's notes in the journal, in order,
// with the cycle's notes sent cycles times, and reports what is missing
// and what was never sent, and how many chord membership rows it holds.
func checkSoakJournal(b *testing.B, path string, cycles int) (missing, extra, memberships int) {
	f, err := os.Open(path)
	if err != nil {
		b.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil || len(recs) == 0 {
		b.Fatalf("journal: %v", err)
	}
	col := func(name string) int {
		i := slices.Index(recs[0], name)
		if i < 0 {
			b.Fatalf("journal has no %s column: %v", name, recs[0])
		}
		return i
	}
	pc, nc, hc := col("player"), col("note"), col("heard_chord")
	heard := map[string][]string{}
	for _, r := range recs[1:] {
		if r[hc] != "" {
			memberships++
			continue
		}
		heard[r[pc]] = append(heard[r[pc]], r[nc])
	}
	for p, name := range strings.Split(cyclePlayers, ",") {
		var sent []string
		for range cycles {
			for _, n := range quartetCycle {
				if n.player == p {
					sent = append(sent, n.note)
				}
			}
		}
		m, e := noteDiff(sent, heard[name])
		if m+e > 0 {
			b.Errorf("%s: %d notes sent, %d in the journal; %d missing, %d never sent", name, len(sent), len(heard[name]), m, e)
		}
		missing, extra = missing+m, extra+e
	}
	return missing, extra, memberships
}

// noteDiff counts what a longest common subsequence of sent and heard
// leaves out of each.
func noteDiff(sent, heard []string) (missing, extra int) {
	prev, cur := make([]int, len(heard)+1), make([]int, len(heard)+1)
	for i := range sent {
		for j := range heard {
			if sent[i] == heard[j] {
				cur[j+1] = prev[j] + 1
			} else {
				cur[j+1] = max(prev[j+1], cur[j])
			}
		}
		prev, cur = cur, prev
	}
	common := prev[len(heard)]
	return len(sent) - common, len(heard) - common
}
