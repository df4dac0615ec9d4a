package report

import (
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
)

// rolesPanel: the group's chord roles, each role's mean ± scatter of cents
// from just, its chord quality and count under its name; the tolerance band
// is drawn about just.
func rolesPanel(g Group, opt Options) (*plot.Plot, error) {
	p := newPanel("Per chord role: mean ± scatter", "member, chord quality", "cents from just")
	var m meanScatter
	labels := make([]string, len(g.Roles))
	for i, r := range g.Roles {
		labels[i] = roleLabel(r)
		m.XYs = append(m.XYs, plotter.XY{X: float64(i), Y: r.Mean})
		m.err = append(m.err, r.Scatter)
	}
	if err := m.draw(p, labels, opt.Tolerance); err != nil {
		return nil, err
	}
	return p, nil
}

// roleLabel is a role's tick label, a word a line: on one line each,
// "dominant seventh" beside "doubled root" ran into its neighbour.
func roleLabel(r Role) string {
	name := r.Member
	if name == "root" {
		name = "doubled root" // an octave of the lowest
	}
	if name == "seventh" && r.Ratio != "" {
		name += " " + r.Ratio
	}
	return strings.ReplaceAll(name+"\n"+r.Quality, " ", "\n") + "\n" + plural(r.Count, "chord")
}
