package report

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"encoding/xml"
	"errors"
	"image"
	"image/png"
	"io"
	"strings"
	"testing"
)

func sampleGroups() ([]Group, Options) {
	opt := Options{Tolerance: 5}
	return Summarize(sampleEntries(), opt), opt
}

func TestTextTable(t *testing.T) {
	groups, opt := sampleGroups()
	var b bytes.Buffer
	if err := WriteText(&b, groups, opt); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for _, want := range []string{
		"Ann · G major · 1/4-comma meantone · A4 = 415 Hz — 5 notes",
		"within ±5 ¢",
		"F#4   3      +6.0    +6.0      2.0       33%          sits 6 ¢ high",
		"1× on Gb5",
		"drifted 4 ¢ sharp over 20 min",
		"(no player named)",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("table lacks %q:\n%s", want, out)
		}
	}
}

func TestCSV(t *testing.T) {
	groups, _ := sampleGroups()
	var b bytes.Buffer
	if err := WriteCSV(&b, groups); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&b).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if strings.Join(recs[0], ",") != strings.Join(csvHeader, ",") {
		t.Errorf("header %v", recs[0])
	}
	want := "Ann,G major,meantone:1/4,,note,F#4,6,3,6.00,6.00,2.00,1,0.333,sits 6 ¢ high,0,,0.2000,4.00,20.00,drifted 4 ¢ sharp over 20 min"
	found := false
	for _, r := range recs {
		found = found || strings.Join(r, ",") == want
	}
	if !found {
		t.Errorf("no row %q in %v", want, recs)
	}
	// Per group: its notes, its pitch classes, then one "all" row.
	if n := len(recs) - 1; n != 3+2+1+1+1+1 {
		t.Errorf("%d rows", n)
	}
}

func TestJSON(t *testing.T) {
	groups, opt := sampleGroups()
	var b bytes.Buffer
	if err := WriteJSON(&b, groups, opt); err != nil {
		t.Fatal(err)
	}
	var got struct {
		Tolerance float64 `json:"tolerance_cents"`
		Groups    []Group `json:"groups"`
	}
	if err := json.Unmarshal(b.Bytes(), &got); err != nil {
		t.Fatal(err)
	}
	if got.Tolerance != 5 || len(got.Groups) != 2 || got.Groups[0].Notes[1].Label != "F#4" || got.Groups[0].Notes[1].Trend.Drift != 4 {
		t.Errorf("%+v", got)
	}
}

func TestPlotPNGIsAPictureOfTheStatedSize(t *testing.T) {
	groups, opt := sampleGroups()
	for _, gs := range [][]Group{groups[:1], groups} { // one tuning, and a legend of two
		var b bytes.Buffer
		if err := Plot(&b, "png", sampleEntries(), gs, opt); err != nil {
			t.Fatal(err)
		}
		img, err := png.Decode(&b)
		if err != nil {
			t.Fatal(err)
		}
		// 12 × 8 in at 150 dpi.
		if got := img.Bounds(); got != image.Rect(0, 0, 1800, 1200) {
			t.Errorf("image %v, want 1800×1200", got)
		}
	}
}

func TestPlotSVGIsXMLWithTheTuningInItsTitle(t *testing.T) {
	groups, opt := sampleGroups()
	var b bytes.Buffer
	if err := Plot(&b, "svg", sampleEntries(), groups[:1], opt); err != nil {
		t.Fatal(err)
	}
	svg := b.String()
	dec := xml.NewDecoder(strings.NewReader(svg))
	root := ""
	for {
		tok, err := dec.Token()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			t.Fatalf("not XML: %v", err)
		}
		if se, ok := tok.(xml.StartElement); ok && root == "" {
			root = se.Name.Local
		}
	}
	if root != "svg" {
		t.Errorf("root element %q", root)
	}
	if !strings.Contains(svg, "Ann · G major · 1/4-comma meantone · A4 = 415 Hz") {
		t.Error("title does not state the tuning")
	}
}

func TestPlotRefusesOtherFormats(t *testing.T) {
	groups, opt := sampleGroups()
	if err := Plot(io.Discard, "gif", sampleEntries(), groups, opt); err == nil {
		t.Error("drew a gif")
	}
}
