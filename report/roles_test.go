package report

import (
	"bytes"
	"encoding/csv"
	"strings"
	"testing"

	"fifthline/journal"
	"fifthline/target"
)

// member is a chord membership row of the given player.
func member(player, chord, role string, just float64, reference bool) journal.Entry {
	n, _ := target.ParseNote("C4")
	return journal.Entry{Player: player, Key: "C major", Temperament: "equal", A4: 440, Note: n,
		HeardChord: chord, Member: role, JustCents: just, Reference: reference}
}

// Where each player sits in the chords, in the words of the trade (common
// practice): a third above just is sharp; a fifth whose upper note lies
// below 3/2 above the root is narrow, above it wide. A role is put into
// words from RoleChords chords on; the lowest root, the reference, is not
// a reading; memberships are never counted as notes.
func TestChordRoles(t *testing.T) {
	var es []journal.Entry
	for _, j := range []float64{5, 6, 7} { // mean 6, scatter √(2/3) = 0.816 (hand-computed)
		es = append(es, member("vla", "C major", "third", j, false), member("vc", "C major", "root", 0, true))
	}
	es = append(es,
		member("vla", "F major", "fifth", -1.5, false), member("vla", "G major", "fifth", -0.5, false),
		member("vla", "D major", "fifth", -1, false),
		member("vla", "A minor", "third", -3, false), member("vla", "E minor", "third", -3, false),
		member("vl1", "C major", "fifth", 2, false), member("vl1", "C major", "fifth", 1, false), member("vl1", "C major", "fifth", 1.5, false))
	n, _ := target.ParseNote("C3")
	es = append(es, journal.Entry{Player: "vc", Key: "C major", Temperament: "equal", A4: 440, Note: n, Cents: 1})
	groups := Summarize(es, Options{Tolerance: 5})
	words := map[string]string{}
	for _, g := range groups {
		words[g.Who()] = g.RoleWords()
		if g.Who() == "vc" && (g.All.Count != 1 || len(g.Roles) != 0) {
			t.Errorf("vc: %d notes, roles %+v; want its one note and no role (the reference is no reading)", g.All.Count, g.Roles)
		}
	}
	want := map[string]string{
		"vla": "thirds in major chords sit 6.0 ¢ above just (sharp) (3 chords); fifths 1.0 ¢ narrow (3 chords)",
		"vl1": "fifths in major chords sit 1.5 ¢ wide (3 chords)",
		"vc":  "",
	}
	for who, w := range want {
		if words[who] != w {
			t.Errorf("%s: %q, want %q", who, words[who], w)
		}
	}
	// Two minor thirds are shown, not put into words.
	var b bytes.Buffer
	if err := WriteCSV(&b, groups, Options{Tolerance: 5}); err != nil {
		t.Fatal(err)
	}
	recs, _ := csv.NewReader(&b).ReadAll()
	var rows []string
	for _, r := range recs {
		if r[6] == "chord_role" {
			rows = append(rows, strings.Join(r, ","))
		}
	}
	wantRows := []string{
		"vla,C major,equal,440,,,chord_role,,,3,6.00,6.00,0.82,,,,,,6.0 ¢ above just (sharp),,,,,,,,,major,third,,",
		"vla,C major,equal,440,,,chord_role,,,3,-1.00,-1.00,0.41,,,,,,1.0 ¢ narrow,,,,,,,,,major,fifth,,",
		"vla,C major,equal,440,,,chord_role,,,2,-3.00,-3.00,0.00,,,,,,,,,,,,,,,minor,third,,",
		"vl1,C major,equal,440,,,chord_role,,,3,1.50,1.50,0.41,,,,,,1.5 ¢ wide,,,,,,,,,major,fifth,,",
	}
	if strings.Join(rows, "\n") != strings.Join(wantRows, "\n") {
		t.Errorf("chord role rows\n%s\nwant\n%s", strings.Join(rows, "\n"), strings.Join(wantRows, "\n"))
	}
}

// The plot gives a player with chord roles a panel of them beside the
// notes' panels, each role named with its chord quality and count; the
// memberships are not counted among the held notes.
func TestPlotShowsChordRoles(t *testing.T) {
	es := sampleEntries()
	for range 3 {
		es = append(es, member("Ann", "D major", "third", 6, false))
	}
	for i := range es[len(es)-3:] {
		es[len(es)-3+i].Key, es[len(es)-3+i].Temperament, es[len(es)-3+i].A4 = "G major", "meantone:1/4", 415
	}
	opt := Options{Tolerance: 5}
	var b bytes.Buffer
	if err := Plot(&b, "svg", es, Summarize(es, opt), opt); err != nil {
		t.Fatal(err)
	}
	svg := b.String()
	for _, want := range []string{"Per chord role: mean ± scatter", "third", "3 chords", "cents from just",
		"Ann · G major · 1/4-comma meantone · A4 = 415 Hz — 6 held notes (1 on the other spelling)"} {
		if !strings.Contains(svg, xmlText(want)) {
			t.Errorf("svg lacks %q", want)
		}
	}
}

// The plot's chord-role labels put a word on each line, so that two roles
// side by side ("doubled root" of a major chord beside the seventh of a
// dominant seventh) do not run into each other (issue: the plot "does not
// overlap its labels").
func TestRoleLabelsAWordALine(t *testing.T) {
	for _, c := range []struct {
		r    Role
		want string
	}{
		{Role{Member: "root", Quality: "major", Count: 1}, "doubled\nroot\nmajor\n1 chord"},
		{Role{Member: "seventh", Quality: "dominant seventh", Count: 3}, "seventh\ndominant\nseventh\n3 chords"},
		{Role{Member: "third", Quality: "half-diminished seventh", Count: 2}, "third\nhalf-diminished\nseventh\n2 chords"},
	} {
		if got := roleLabel(c.r); got != c.want {
			t.Errorf("%+v: %q, want %q", c.r, got, c.want)
		}
	}
}

// Which seventh is just is a choice (--seventh: 16/9 by default, 9/5, or
// 7/4, the harmonic seventh; common practice): the journal says which
// ratio each seventh was judged against, and report keeps sevenths judged
// against different ratios apart, naming the ratio in the table, the
// words and the CSV. Journals older than the just_ratio column give no
// ratio (—).
func TestSeventhsAreReportedWithTheRatioTheyWereJudgedAgainst(t *testing.T) {
	var es []journal.Entry
	for _, j := range []float64{3.5, 4, 4.5} {
		e := member("vl1", "G dominant seventh", "seventh", j, false)
		e.JustRatio = "16/9"
		es = append(es, e)
	}
	e := member("vl1", "G dominant seventh", "seventh", -27, false)
	e.JustRatio = "7/4"
	es = append(es, e, member("vl1", "C major", "third", 2, false))
	groups := Summarize(es, Options{Tolerance: 5})
	if len(groups) != 1 || len(groups[0].Roles) != 3 {
		t.Fatalf("groups %+v", groups)
	}
	g := groups[0]
	if w := g.RoleWords(); w != "sevenths against 16/9 in dominant seventh chords sit 4.0 ¢ above just (sharp) (3 chords)" {
		t.Errorf("words %q", w)
	}
	var b bytes.Buffer
	if err := writeRoles(&b, g); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"dominant seventh  seventh  16/9", "dominant seventh  seventh  7/4 ", "major             third    —"} {
		if !strings.Contains(b.String(), want) {
			t.Errorf("roles table lacks %q:\n%s", want, b.String())
		}
	}
	b.Reset()
	if err := WriteCSV(&b, groups, Options{Tolerance: 5}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(b.String(), ",dominant seventh,seventh,7/4,\n") || !strings.Contains(b.String(), ",major,third,,\n") {
		t.Errorf("CSV:\n%s", b.String())
	}
	if got := roleLabel(g.Roles[0]); got != "seventh\n16/9\ndominant\nseventh\n3 chords" {
		t.Errorf("plot label %q", got)
	}
}
