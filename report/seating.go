package report

import (
	"cmp"
	"slices"
	"strconv"

	"fifthline/journal"
)

// Players are listed in the order they sit, the order a group gave them
// (--players vc,vla,vl2,vl1 puts vc on the first channel): by the channel
// the journal gives each (the first it gives a player), and players it
// gives none where they first appear. Musicians read their parts from the
// bottom of the score up, not alphabetically.

// channels is each player's first channel in the entries (from 1); a
// player the journal gives no channel is not in it.
func channels(entries []journal.Entry) map[string]int {
	at := map[string]int{}
	for _, e := range entries {
		if _, ok := at[e.Player]; !ok && e.Channel > 0 && e.Player != "" {
			at[e.Player] = e.Channel
		}
	}
	return at
}

// seat orders the items that sit on a channel (sits) by compare within the
// places they took, leaving the others in place; ties keep their order.
func seat[T any](xs []T, sits func(T) bool, compare func(a, b T) int) {
	var at []int
	var sat []T
	for i, x := range xs {
		if sits(x) {
			at, sat = append(at, i), append(sat, x)
		}
	}
	slices.SortStableFunc(sat, compare)
	for k, i := range at {
		xs[i] = sat[k]
	}
}

// seatPlayers orders player names by their channels.
func seatPlayers(names []string, channel map[string]int) {
	seat(names, func(n string) bool { return channel[n] > 0 },
		func(a, b string) int { return cmp.Compare(channel[a], channel[b]) })
}

// seatGroups orders the groups of players on channels by channel within
// each tuning, the tunings in the order they first appear; a --voices
// group's voices likewise by number, voice 1 (the lowest) first, whichever
// voice's note happened to end first.
func seatGroups(groups []Group, channel map[string]int) {
	place := func(g Group) int {
		if c := channel[g.Player]; c > 0 {
			return c
		}
		n, _ := strconv.Atoi(g.Voice) // 0, not seated, without a voice
		return n
	}
	var tunings []tuningOf
	rank := func(g Group) int {
		k := g.tuning()
		if i := slices.Index(tunings, k); i >= 0 {
			return i
		}
		tunings = append(tunings, k)
		return len(tunings) - 1
	}
	for _, g := range groups {
		rank(g)
	}
	seat(groups, func(g Group) bool { return place(g) > 0 }, func(a, b Group) int {
		return cmp.Or(cmp.Compare(rank(a), rank(b)), cmp.Compare(place(a), place(b)))
	})
}
