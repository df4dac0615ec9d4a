package main

import (
	"bytes"
	"context"
	"math"
	"os/exec"
	"slices"
	"strings"
	"sync"
	"testing"
	"time"

	"fifthline/capture"
	"fifthline/internal/vmic"
)

// recording reads the default input (the virtual microphone's monitor) into
// memory until stop is called.
func recording(t *testing.T) (rate float64, stop func() []float32) {
	t.Helper()
	in, err := capture.OpenInput(capture.InputOptions{})
	if err != nil {
		t.Fatal(err)
	}
	var mu sync.Mutex
	var got []float32
	done := make(chan struct{})
	ctx, cancel := context.WithCancel(context.Background())
	go func() {
		defer close(done)
		buf := make([]float32, 4096)
		for ctx.Err() == nil {
			n, err := in.Read(buf)
			mu.Lock()
			got = append(got, buf[:n]...)
			mu.Unlock()
			if err != nil {
				return
			}
		}
	}()
	// The null sink may take a moment to wake: wait for its first audio.
	for deadline := time.Now().Add(hangPatience); time.Now().Before(deadline); time.Sleep(10 * time.Millisecond) {
		mu.Lock()
		n := len(got)
		mu.Unlock()
		if n > 0 {
			break
		}
	}
	return in.SampleRate(), func() []float32 {
		cancel()
		in.Close()
		<-done
		mu.Lock()
		defer mu.Unlock()
		return withoutGaps(got)
	}
}

// withoutGaps cuts out the stretches of digital silence a busy machine
// inserts when the player's output runs short (an underrun): the sound
// after one is the sound that was due, only later, so cutting the silence
// joins the tone up again, and its pitch can be measured as played. (How
// often it happens is BenchmarkPlayerDroneUnderMicrophone's to show.) A
// tone at the levels played here (16-bit samples in the null sink, a
// step being 2^-15) is 0 for a sample or two at a zero crossing, never 8 on
// end.
func withoutGaps(x []float32) []float32 {
	const gap = 8
	out, zeros := x[:0], 0
	for _, v := range x {
		if v == 0 {
			zeros++
			continue
		}
		if zeros > 0 && (zeros < gap || len(out) == 0) {
			// Near-silence inside the sound, or silence before it: kept.
			for range zeros {
				out = append(out, 0)
			}
		}
		zeros = 0
		out = append(out, v)
	}
	return out
}

// The drone as a user runs it, recorded off the null sink it plays into:
// each partial sits within 0.1 ¢ of its target, as fixed by the
// temperament's definition, and the peak stays at or below the level.
func TestDroneSoundsTheTargetsAtTheLevel(t *testing.T) {
	bin := fifthlineBinary(t)
	qc := math.Pow(5, 0.25) // ¼-comma meantone fifth (definition: four fifths make 5/1)
	for _, tc := range []struct {
		name  string
		args  []string
		level float64
		want  []float64 // partial frequencies, Hz
	}{
		{
			// A4 = 440 Hz (ISO 16); D4 a fifth below A4, G3 two.
			name: "G3 D4 pure in quarter-comma meantone", level: -18,
			args: []string{"--notes", "G3,D4", "--timbre", "pure", "--temperament", "meantone:1/4"},
			want: []float64{440 / (qc * qc), 440 / qc},
		},
		{
			// A3 is an octave below A4 = 415 Hz (Baroque pitch, common
			// practice); the string timbre has harmonics 1…8.
			name: "A3 string at A4 = 415, level -12", level: -12,
			args: []string{"--notes", "A3", "--timbre", "string", "--a4", "415", "--level", "-12"},
			want: []float64{207.5, 415, 622.5, 830, 1037.5, 1245, 1452.5, 1660},
		},
	} {
		t.Run(tc.name, func(t *testing.T) {
			vmic.Isolate(t)
			rate, stop := recording(t)
			cmd := exec.Command(bin, append([]string{"drone", "--duration", "3s"}, tc.args...)...)
			var stderr bytes.Buffer
			cmd.Stderr = &stderr
			if err := cmd.Run(); err != nil {
				t.Fatalf("fifthline drone: %v\n%s", err, stderr.String())
			}
			time.Sleep(300 * time.Millisecond)
			x := stop()
			if !strings.Contains(stderr.String(), "caution") || !strings.Contains(stderr.String(), "dBFS") {
				t.Errorf("no hearing caution with the level on stderr:\n%s", stderr.String())
			}
			onset := 0
			for onset < len(x) && math.Abs(float64(x[onset])) < 1e-4 {
				onset++
			}
			// Skip the 0.5 s fade in; measure 2 s of the steady drone.
			from, to := onset+int(0.8*rate), onset+int(2.8*rate)
			if to > len(x) {
				t.Fatalf("recorded %d samples, sound from %d: too short", len(x), onset)
			}
			for _, f := range tc.want {
				got := steadyHz(x[from:to], rate, f)
				if c := 1200 * math.Log2(got/f); math.Abs(c) > 0.1 {
					t.Errorf("partial %.4f Hz sounds at %.4f Hz (%+.3f ¢)", f, got, c)
				} else {
					t.Logf("partial %.4f Hz: %+.4f ¢", f, c)
				}
			}
			peak := 0.0
			for _, s := range x {
				peak = math.Max(peak, math.Abs(float64(s)))
			}
			// The null sink holds 16-bit samples: allow half a step.
			if limit := math.Pow(10, tc.level/20) + 0.5/32768; peak > limit {
				t.Errorf("peak %.2f dBFS above the level %g dBFS", 20*math.Log10(peak), tc.level)
			}
			t.Logf("peak %.3f dBFS (level %g)", 20*math.Log10(peak), tc.level)
		})
	}
}

// Too loud is refused before any sound, as a usage error naming the limit.
func TestDroneRefusesLevelsAboveTheLimit(t *testing.T) {
	for _, args := range [][]string{
		{"drone", "--notes", "G3", "--level", "-3"},
		{"drone", "--notes", "G3", "--level", "0"},
		{"drone", "--notes", "H3"},
		{"drone", "--notes", ""}, // given, but empty (without --notes, the tonic and fifth sound)
		{"drone", "--notes", "G3", "--timbre", "organ"},
		{"drone", "--notes", "G3", "--duration", "-1s"},
	} {
		code, _, stderr := runCLI(t, args...)
		checkError(t, code, 2, stderr)
		if args[len(args)-1] == "-3" && !strings.Contains(stderr, "-6 dBFS") {
			t.Errorf("%v: the message does not name the -6 dBFS limit: %q", args, stderr)
		}
	}
	code, _, stderr := runCLI(t, "drone", "--notes", "G3", "--device", "no-such-device-xyz", "--duration", "1s")
	checkError(t, code, 1, stderr)
}

// steadyHz is the partial's frequency near guess over x, the median of its
// frequency over five equal parts: a click where the loaded machine let
// the sound stall (an underrun, which BenchmarkPlayerDroneUnderMicrophone
// counts) breaks the phase of one part, not the pitch the drone sounds.
func steadyHz(x []float32, rate, guess float64) float64 {
	const parts = 5
	n := len(x) / parts
	hz := make([]float64, parts)
	for i := range hz {
		hz[i] = peakHz(x[i*n:(i+1)*n], rate, guess)
	}
	slices.Sort(hz)
	return hz[parts/2]
}

// peakHz is where the magnitude of x's Blackman–Harris windowed DTFT peaks
// near guess: a grid then golden-section search, independent of the
// detector under test.
func peakHz(x []float32, rate, guess float64) float64 {
	n := len(x)
	wx := make([]float64, n)
	for i, v := range x {
		// 4-term Blackman–Harris (Harris, Proc. IEEE 1978), sidelobes −92 dB.
		a := 2 * math.Pi * float64(i) / float64(n-1)
		w := 0.35875 - 0.48829*math.Cos(a) + 0.14128*math.Cos(2*a) - 0.01168*math.Cos(3*a)
		wx[i] = w * float64(v)
	}
	mag := func(f float64) float64 {
		rot := complex(math.Cos(2*math.Pi*f/rate), -math.Sin(2*math.Pi*f/rate))
		ph, sum := complex(1, 0), complex(0, 0)
		for i, v := range wx {
			sum += complex(v, 0) * ph
			ph *= rot
			if i%4096 == 0 {
				ph /= complex(math.Hypot(real(ph), imag(ph)), 0)
			}
		}
		return real(sum)*real(sum) + imag(sum)*imag(sum)
	}
	best, step := guess, 0.1
	for f := guess - 1; f <= guess+1; f += step {
		if mag(f) > mag(best) {
			best = f
		}
	}
	lo, hi := best-step, best+step
	g := (math.Sqrt(5) - 1) / 2
	a, b := hi-g*(hi-lo), lo+g*(hi-lo)
	ma, mb := mag(a), mag(b)
	for hi-lo > 1e-6 {
		if ma > mb {
			hi, b, mb = b, a, ma
			a = hi - g*(hi-lo)
			ma = mag(a)
		} else {
			lo, a, ma = a, b, mb
			b = lo + g*(hi-lo)
			mb = mag(b)
		}
	}
	return (lo + hi) / 2
}

// An output that goes away mid-drone (its private sink suspended) ends the
// command with one line naming the loss, exit 1, instead of playing on into
// nothing.
func TestDroneEndsWhenTheOutputIsLost(t *testing.T) {
	out := vmic.Isolate(t)
	cmd := exec.Command(fifthlineBinary(t), "drone", "--duration", "60s", "--notes", "A3")
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	time.Sleep(1500 * time.Millisecond)
	out.Suspend()
	suspended := time.Now()
	done := make(chan error, 1)
	go func() { done <- cmd.Wait() }()
	select {
	case <-done:
	case <-time.After(15 * time.Second):
		_ = cmd.Process.Kill()
		t.Fatalf("the drone played on 15 s after its output went away:\n%s", stderr.String())
	}
	t.Logf("ended %v after the suspend: %s", time.Since(suspended).Round(time.Millisecond), stderr.String())
	lines := strings.Split(strings.TrimRight(stderr.String(), "\n"), "\n")
	last := lines[len(lines)-1]
	if code := cmd.ProcessState.ExitCode(); code != 1 || !strings.HasPrefix(last, "fifthline: ") || !strings.Contains(last, "output device lost") {
		t.Errorf("exit %d, last line %q; want exit 1 and a line naming the lost output", code, last)
	}
}
