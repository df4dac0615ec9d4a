package ensemble

import (
	"slices"
	"strings"
	"testing"
)

// The contract (/work/shared/interface.md, --players): names in channel
// order, an empty name skipping a channel, or N=name picking channel N.
func TestPlayersAreNamedAsTheContractSays(t *testing.T) {
	for _, c := range []struct {
		in   string
		want []Player
	}{
		{"vc,vla,vl2,vl1", []Player{{"vc", 0}, {"vla", 1}, {"vl2", 2}, {"vl1", 3}}},
		{"vc,,vl2", []Player{{"vc", 0}, {"vl2", 2}}},
		{"3=vla,1=vc", []Player{{"vla", 2}, {"vc", 0}}},
		{" bass , tenor ", []Player{{"bass", 0}, {"tenor", 1}}},
	} {
		got, err := ParsePlayers(c.in)
		if err != nil || !slices.Equal(got, c.want) {
			t.Errorf("%q: %v, %v; want %v", c.in, got, err, c.want)
		}
	}
	for _, bad := range []string{"", ",,", "vc,vc", "1=vc,1=vla", "0=vc", "x=vc", "2=", "a\"b"} {
		if _, err := ParsePlayers(bad); err == nil || strings.Contains(err.Error(), "\n") {
			t.Errorf("%q: accepted or not one line (%v)", bad, err)
		}
	}
}

func TestMorePlayersThanChannelsSaysHowMany(t *testing.T) {
	ps, _ := ParsePlayers("a,b,c")
	// The message says what to do: fewer names, or channels picked (the
	// contract's 3=vla,1=vc form).
	if err := CheckChannels(ps, 2, "duo.wav"); err == nil || !strings.Contains(err.Error(), "duo.wav has 2 channels") ||
		!strings.Contains(err.Error(), "name at most 2 players, or pick their channels") {
		t.Errorf("got %v", err)
	}
	if err := CheckChannels(ps, 1, "solo.wav"); err == nil || !strings.Contains(err.Error(), "one channel") {
		t.Errorf("mono: got %v", err)
	}
	if err := CheckChannels(ps, 4, "quartet.wav"); err != nil {
		t.Error(err)
	}
}

func FuzzParsePlayers(f *testing.F) {
	for _, s := range []string{"vc,vla,vl2,vl1", "3=vla,1=vc", ",,x", "1=,2=b", "99999999999999999999=a"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		ps, err := ParsePlayers(s)
		if err != nil {
			if strings.Contains(err.Error(), "\n") {
				t.Errorf("two-line error for %q", s)
			}
			return
		}
		seen := map[string]bool{}
		for _, p := range ps {
			if p.Name == "" || p.Channel < 0 || seen[p.Name] {
				t.Errorf("%q gave %+v", s, ps)
			}
			seen[p.Name] = true
		}
	})
}
