package ensemble

import (
	"fmt"
	"strconv"
	"strings"
)

// ParsePlayers reads a --players value: names in channel order
// ("vc,vla,vl2,vl1", an empty name skipping its channel), or channels
// picked by number counted from 1 ("3=vla,1=vc"). Names are kept as
// written; two players may not share a name or a channel.
func ParsePlayers(s string) ([]Player, error) {
	if strings.TrimSpace(s) == "" {
		return nil, fmt.Errorf("--players is empty: name one player per channel, e.g. vc,vla,vl2,vl1")
	}
	var out []Player
	names, channels := map[string]bool{}, map[int]bool{}
	for i, field := range strings.Split(s, ",") {
		name, ch := strings.TrimSpace(field), i
		if num, rest, ok := strings.Cut(field, "="); ok {
			n, err := strconv.Atoi(strings.TrimSpace(num))
			if err != nil || n < 1 {
				return nil, fmt.Errorf("--players %q: %q is not a channel number counted from 1", s, strings.TrimSpace(num))
			}
			name, ch = strings.TrimSpace(rest), n-1
		}
		if name == "" {
			if strings.Contains(field, "=") {
				return nil, fmt.Errorf("--players %q: channel %d has no name", s, ch+1)
			}
			continue // an empty name skips its channel
		}
		if strings.ContainsAny(name, "\"\n\r") {
			return nil, fmt.Errorf("--players %q: a name may not hold quotes or line breaks", s)
		}
		switch {
		case names[name]:
			return nil, fmt.Errorf("--players %q: %s is named twice", s, name)
		case channels[ch]:
			return nil, fmt.Errorf("--players %q: channel %d is given twice", s, ch+1)
		}
		names[name], channels[ch] = true, true
		out = append(out, Player{Name: name, Channel: ch})
	}
	if len(out) == 0 {
		return nil, fmt.Errorf("--players %q names nobody", s)
	}
	return out, nil
}

// CheckChannels tells, in one line, when the players need more channels
// than what is heard has (named by what, e.g. "take.wav" or a device).
func CheckChannels(players []Player, channels int, what string) error {
	if channels < 2 {
		return fmt.Errorf("%s has one channel; --players needs one channel per player (for one microphone on the whole group, use --voices)", what)
	}
	for _, p := range players {
		if p.Channel >= channels {
			return fmt.Errorf("%s has %d channels; %s would be on channel %d: name at most %d players, or pick their channels (2=%s)",
				what, channels, p.Name, p.Channel+1, channels, p.Name)
		}
	}
	return nil
}
