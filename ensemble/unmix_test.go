package ensemble

import (
	"math"
	"math/rand/v2"
	"testing"

	"fifthline/internal/testsignal"
)

// unmixTake mixes sources as close microphones hear them: channel c is
// source c plus every other source d, gain[c][d] times, delay[c][d]
// samples late (whole samples, so the truth is exact).
func unmixTake(src [][]float64, gain [][]float64, delay [][]int) [][]float64 {
	heard := make([][]float64, len(src))
	for c := range src {
		heard[c] = append([]float64(nil), src[c]...)
		for d := range src {
			if d == c {
				continue
			}
			for t := delay[c][d]; t < len(src[d]); t++ {
				heard[c][t] += gain[c][d] * src[d][t-delay[c][d]]
			}
		}
	}
	return heard
}

// cleanBlocks cleans heard block by block, with the model m, as Run does.
func cleanBlocks(m *bleedModel, heard [][]float64, hop int) [][]float64 {
	h := newHistory(len(heard), rate)
	out := make([][]float64, len(heard))
	dst, blocks := make([][]float32, len(heard)), make([][]float32, len(heard))
	for c := range dst {
		dst[c] = make([]float32, hop)
	}
	for at := 0; at+hop <= len(heard[0]); at += hop {
		for c := range heard {
			blocks[c] = testsignal.Float32(heard[c][at : at+hop])
		}
		h.push(blocks)
		m.cleanAll(h, dst)
		h.shift()
		for c := range out {
			for _, s := range dst[c] {
				out[c] = append(out[c], float64(s))
			}
		}
	}
	return out
}

// With each pair's gain and delay known, every channel cleaned is its
// player's own sound: nothing left of the others, not even what the
// neighbours' microphones heard of the channel's own player and of third
// players (which subtracting the neighbours as heard leaves, measured
// here, 26–29 dB below the channel's own sound). Levels and delays as the
// ensemble issue measured close microphones: neighbours 15–25 dB down,
// 1–6 ms late (at 48 kHz).
func TestCleaningLeavesEachPlayerAlone(t *testing.T) {
	db := [][]float64{{0, 18, 22, 25}, {17, 0, 16, 21}, {21, 15, 0, 19}, {24, 20, 16, 0}}
	delay := [][]int{{0, 67, 149, 269}, {58, 0, 110, 197}, {163, 101, 0, 82}, {278, 187, 77, 0}}
	gain := make([][]float64, 4)
	m := newBleedModel(4096, 4)
	for c := range gain {
		gain[c] = make([]float64, 4)
		for d := range gain {
			if d != c {
				gain[c][d] = math.Pow(10, -db[c][d]/20)
				p := m.pair(c, d)
				p.gain, p.delay = gain[c][d], float64(delay[c][d])
			}
		}
	}
	r := rand.New(rand.NewPCG(1, 2))
	src := make([][]float64, 4)
	for c := range src {
		// White noise: every frequency at once, so no residue hides.
		src[c] = testsignal.White(r, 48000)
		testsignal.Normalize(src[c], 0.25)
	}
	clean := cleanBlocks(m, unmixTake(src, gain, delay), 512)
	for c := range src {
		var left float64
		for t := range clean[c] {
			left += sqr(clean[c][t] - src[c][t])
		}
		// float32 samples: rounding alone is some 150 dB down.
		if rel := 10*math.Log10(left/float64(len(clean[c]))) - 20*math.Log10(testsignal.RMS(src[c])); rel > -120 {
			t.Errorf("channel %d cleaned: %.1f dB of others left against its own sound; want none (below -120 dB)", c, rel)
		}
	}
}

// Gains too large for the recursion to settle (a channel's summing to
// maxUnmixGain or more, as an estimate may while it learns) fall back to
// subtracting the neighbours as heard: the cleaned channels stay bounded.
func TestCleaningWithOverlargeGainsStaysBounded(t *testing.T) {
	m := newBleedModel(4096, 3)
	for c := range 3 {
		for d := range 3 {
			if d != c {
				p := m.pair(c, d)
				p.gain, p.delay = maxBleedGain, 50.5
			}
		}
	}
	r := rand.New(rand.NewPCG(3, 4))
	heard := make([][]float64, 3)
	for c := range heard {
		heard[c] = testsignal.White(r, 48000)
		testsignal.Normalize(heard[c], 0.25)
	}
	for c, ch := range cleanBlocks(m, heard, 512) {
		for _, s := range ch {
			if !(math.Abs(s) <= 0.25*(1+2*maxBleedGain)) {
				t.Fatalf("channel %d cleaned reaches %g; the heard peak 0.25 and two neighbours at gain %g bound it by %g", c, s, maxBleedGain, 0.25*(1+2*maxBleedGain))
			}
		}
	}
}
