package model

import (
	"fmt"
	"slices"
	"strings"

	"github.com/hashicorp/hcl/v2"
)

var lossSchema = schema("node", "reach", "station", "contraction", "expansion")

// maxLossCoefficient bounds a transition loss coefficient: the published
// coefficients run from about 0.05 (a well-warped transition) to 1.0 (a
// sudden expansion into a pool). Source: common practice (no published
// source) for the bound itself.
const maxLossCoefficient = 2.0

// loss decodes a `loss` block: at a node, at a section change inside a
// reach, or (with neither) the model-wide default.
func (d *decoder) loss(b *hcl.Block) *Loss {
	l := &Loss{Src: newSrc(b), Name: d.blockName(b)}
	a, _ := d.attrs(b, lossSchema, &l.Src)
	l.NodeName, _ = a.name("node")
	l.ReachName, _ = a.name("reach")
	switch {
	case a.has("node") && a.has("reach"):
		d.Errorf(a.m["reach"].NameRange, "Loss at a node and in a reach",
			"%s names both a node and a reach; a loss is at a node (node = ...) or at a section change inside a reach (reach = ... and station = ...), not both.", a.what)
	case a.has("station") && !a.has("reach"):
		d.Errorf(a.m["station"].NameRange, "Station without a reach",
			"%s gives a station but no reach; add reach = \"...\" for a section change inside a reach, or write node = \"...\" for a loss at a node.", a.what)
	case a.has("reach") && !a.has("station"):
		d.Errorf(b.Body.MissingItemRange(), "Missing required argument",
			"%s is in reach %q and needs the station of the section change; add station = ....", a.what, l.ReachName)
	}
	if a.has("station") {
		l.Station, _ = a.station("station")
	}
	if !a.has("contraction") && !a.has("expansion") {
		d.Errorf(b.Body.MissingItemRange(), "Missing loss coefficient",
			"%s needs contraction (where the velocity head rises downstream) or expansion (where it falls), or both; e.g. contraction = 0.1, expansion = 0.2 for a warped transition.", a.what)
	}
	l.Contraction = d.lossCoefficient(a, "contraction")
	l.Expansion = d.lossCoefficient(a, "expansion")
	return l
}

// lossCoefficient decodes one coefficient: 0 when not written, else a
// number in [0, maxLossCoefficient].
func (d *decoder) lossCoefficient(a attrSet, name string) float64 {
	k, ok := a.number(name)
	if !ok {
		return 0
	}
	if k < 0 || k > maxLossCoefficient {
		d.Errorf(a.m[name].Expr.Range(), "Loss coefficient out of range",
			"%s of %s is %g; a transition loss coefficient lies between 0 and %g (about 0.1 to 0.5 for channel transitions, 1.0 for an outlet into a pool).",
			name, a.what, k, maxLossCoefficient)
		return 0
	}
	return k
}

// resolveLosses checks the reach and station of the losses inside reaches
// and the single default (after references are resolved; losses at nodes
// are attached by attachNodeLosses once the network exists).
func (d *decoder) resolveLosses() {
	m := d.m
	index(d, "loss", m.Losses, func(l *Loss) (string, hcl.Range) { return l.Name, l.LabelRange })
	for _, l := range m.Losses {
		switch {
		case l.Default():
			if m.DefaultLoss != nil {
				d.Errorf(l.DefRange, "Second default loss",
					"loss %q names neither a node nor a reach, so it is the model-wide default, but loss %q (line %d) already is; keep one default, or give this one node = ... or reach = ... and station = ....",
					l.Name, m.DefaultLoss.Name, m.DefaultLoss.DefRange.Start.Line)
				continue
			}
			m.DefaultLoss = l
		case l.ReachName != "" && l.NodeName == "":
			what := ownerOf("loss", l.Name)
			l.Reach = d.lookupReach(l.ReachName, l.At("reach"), what)
			if l.Reach == nil || !l.hasStation() {
				continue
			}
			d.checkLossStation(l)
		}
	}
	for _, r := range m.Reaches {
		byStation(r.Losses, func(l *Loss) float64 { return l.Station })
	}
}

func (l *Loss) hasStation() bool { return l.Has("station") }

// checkLossStation checks that a loss inside a reach stands at a change
// of section and is the only one there.
func (d *decoder) checkLossStation(l *Loss) {
	r := l.Reach
	changes := sectionChanges(r)
	found := false
	for _, x := range changes {
		if x == l.Station {
			found = true
		}
	}
	if !found {
		where := "the reach has no change of section (add a segment)"
		if len(changes) > 0 {
			list := make([]string, len(changes))
			for i, x := range changes {
				list[i] = fmt.Sprintf("%g", x)
			}
			where = "its sections change at station " + strings.Join(list, ", ")
		}
		d.Errorf(l.At("station"), "No section change at the station",
			"loss %q is at station %g of reach %q, where the section does not change; a loss inside a reach stands where a segment begins or ends and the section changes: %s. For a loss between reaches use node = ....",
			l.Name, l.Station, r.Name, where)
		return
	}
	if prev := r.LossAt(l.Station); prev != nil {
		d.Errorf(l.At("station"), "Two losses at one place",
			"loss %q is at station %g of reach %q, where loss %q (line %d) already is; keep one.",
			l.Name, l.Station, r.Name, prev.Name, prev.DefRange.Start.Line)
		return
	}
	r.Losses = append(r.Losses, l)
}

// sectionChanges lists the stations strictly inside a reach where the
// section in force changes, ascending.
func sectionChanges(r *Reach) []float64 {
	var out []float64
	for _, s := range r.Segments {
		for _, x := range []float64{s.FromStation, s.ToStation} {
			if x <= 0 || x >= r.Length || (len(out) > 0 && out[len(out)-1] == x) {
				continue
			}
			const eps = 1e-9
			if r.SectionAt(x-eps*max(1, r.Length)) != r.SectionAt(x+eps*max(1, r.Length)) {
				out = append(out, x)
			}
		}
	}
	return out
}

// attachNodeLosses attaches the losses written at nodes (after the
// network is built): the node must exist and have a reach ending at it.
func (d *decoder) attachNodeLosses(nodes map[string]*Node) {
	for _, l := range d.m.Losses {
		if l.NodeName == "" || l.ReachName != "" {
			continue
		}
		n, ok := nodes[l.NodeName]
		if !ok {
			var names []string
			for name := range nodes {
				names = append(names, name)
			}
			slices.Sort(names)
			d.Errorf(l.At("node"), "Unknown node",
				"loss %q names node %q, which no reach starts or ends at; use the from or to node of a reach.%s",
				l.Name, l.NodeName, suggest(l.NodeName, names))
			continue
		}
		if len(n.In) == 0 {
			d.Errorf(l.At("node"), "Loss at a headwater node",
				"loss %q is at node %q, where reach %q starts and no reach ends, so there is no flow arriving to lose head; put the loss at a node between two reaches, or at a section change inside the reach.",
				l.Name, l.NodeName, n.Out.Name)
			continue
		}
		if n.Loss != nil {
			d.Errorf(l.At("node"), "Two losses at one place",
				"loss %q is at node %q, where loss %q (line %d) already is; keep one.",
				l.Name, l.NodeName, n.Loss.Name, n.Loss.DefRange.Start.Line)
			continue
		}
		n.Loss, l.Node = l, n
		for _, r := range n.In {
			r.EndLoss = l
		}
	}
}
