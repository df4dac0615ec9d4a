package journal

import (
	"math"
	"strings"
	"testing"
)

// The reader takes files from disks and spreadsheets: it must never panic,
// and what it accepts must be usable numbers.
func FuzzRead(f *testing.F) {
	f.Add(headerLine() + sampleLine + "\n")
	f.Add(headerLine() + sampleLine[:50])
	f.Add(strings.TrimSuffix(headerLine(), "\n") + ",on_other_spelling\n" + strings.Replace(sampleLine, "Db5,40.00", ",", 1) + ",true\n")
	f.Add("time,session\n1,2\n")
	f.Add(olderHeaderLine() + olderSampleLine() + "\n" + headerLine() + sampleLine + "\n")
	f.Add(headerLine() + strings.TrimSuffix(sampleLine, ",,,,,,,tonic") + ",2,E major,third,+6.00,,5/4,a4\n")
	f.Add(headerLine() + strings.TrimSuffix(sampleLine, ",,,,,,,tonic") + ",,E major,,x,,16/0,A4\n")
	f.Add("\"\n\"")
	f.Add("")
	f.Fuzz(func(t *testing.T, body string) {
		entries, warns, err := Read(strings.NewReader(body), "fuzz")
		if err != nil && (entries != nil || strings.Contains(err.Error(), "\n")) {
			t.Fatalf("error %q with %d entries", err, len(entries))
		}
		if len(warns) > maxWarnings+1 {
			t.Fatalf("%d warnings", len(warns))
		}
		for _, w := range warns {
			if strings.ContainsAny(w, "\r\n") {
				t.Fatalf("warning on several lines: %q", w)
			}
		}
		for _, e := range entries {
			if e.SatOnOther() && (!e.HasAlt || e.SamePitch && !e.OnOtherKnown) {
				t.Fatalf("on the other spelling without one: %+v", e)
			}
			if e.JustRatio != "" && (e.HeardChord == "" || !isRatio(e.JustRatio)) {
				t.Fatalf("a just ratio %q off a chord's row: %+v", e.JustRatio, e)
			}
			if e.HeardChord != "" && e.Member == "" || e.Reference && e.Member != "root" {
				t.Fatalf("a chord membership without its member: %+v", e)
			}
			for _, x := range []float64{e.Cents, e.AltCents, e.Hz, e.Start, e.A4, e.JustCents} {
				if math.IsNaN(x) || math.IsInf(x, 0) {
					t.Fatalf("non-finite value in %+v", e)
				}
			}
		}
	})
}
