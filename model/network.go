package model

import (
	"fmt"
	"math"
	"strings"
)

// network builds the tree of reaches: nodes, the single outlet, the
// topological order, headwaters, and the invert elevations.
//
// Invert rule: a reach with `invert` keeps the elevations written. A reach
// with `slope` ends at the elevation of its `to` node, which is the upstream
// invert of the reach leaving that node, or 0 at the outlet node; its
// upstream invert is that plus slope × length. Elevations are therefore
// derived from the outlet upwards, and a reach with `invert` fixes the datum
// for everything above it that uses `slope`. A reach with `invert` may end
// above or below the next reach's upstream invert (a drop or a step at the
// node).
func (d *decoder) network() {
	m := d.m
	net := &Network{}
	// A reach names two nodes at most: the nodes are taken from one
	// array that never grows.
	nodes := make(map[string]*Node, len(m.Reaches)+1)
	pool := make([]Node, 0, 2*len(m.Reaches))
	net.Nodes = make([]*Node, 0, len(m.Reaches)+1)
	node := func(name string) *Node {
		n, ok := nodes[name]
		if !ok {
			pool = append(pool, Node{Name: name})
			n = &pool[len(pool)-1]
			nodes[name] = n
			net.Nodes = append(net.Nodes, n)
		}
		return n
	}
	for _, r := range m.Reaches {
		if r.From == "" || r.To == "" {
			continue
		}
		if r.From == r.To {
			d.Errorf(r.At("to"), "Reach ends where it starts",
				"reach %q runs from node %q to the same node; give it a different downstream node.", r.Name, r.To)
			continue
		}
		f, t := node(r.From), node(r.To)
		if f.Out != nil {
			d.Errorf(r.At("from"), "Two reaches leave one node",
				"reach %q and reach %q (line %d) both start at node %q; the network must be a tree in which water leaves each node by one reach. Rename one start node or join the reaches downstream.",
				r.Name, f.Out.Name, f.Out.DefRange.Start.Line, r.From)
			continue
		}
		f.Out = r
		t.In = append(t.In, r)
	}
	if d.Diags.HasErrors() {
		return
	}
	for _, r := range m.Reaches {
		r.Upstream = nodes[r.From].In
		r.Downstream = nodes[r.To].Out
	}
	if d.cycles() {
		return
	}
	var outlets []*Node
	for _, n := range net.Nodes {
		if n.Out == nil {
			outlets = append(outlets, n)
		}
	}
	if len(outlets) > 1 {
		list := make([]string, len(outlets))
		for i, n := range outlets {
			list[i] = fmt.Sprintf("%q", n.Name)
		}
		// A misspelt node name is the usual cause: point at it if one
		// outlet is a near miss of a node that water does leave.
		at, hint := outlets[1].In[0].At("to"), ""
		var inner []string
		for _, n := range net.Nodes {
			if n.Out != nil {
				inner = append(inner, n.Name)
			}
		}
		d.cells = suggestCells
		for i, n := range outlets {
			if i == maxSuggestions {
				break // bounded work on a hostile file
			}
			if h := suggestWithin(n.Name, inner, &d.cells); h != "" {
				at, hint = n.In[0].At("to"), fmt.Sprintf(" Reach %q ends at %q.%s", n.In[0].Name, n.Name, h)
				break
			}
		}
		d.Errorf(at, "More than one outlet",
			"Nodes %s have no reach leaving them, so the network falls apart into %d separate parts. Connect the parts so that all water leaves through one outlet node, or put each part in its own model.%s",
			strings.Join(list, ", "), len(outlets), hint)
		return
	}
	net.Outlet = outlets[0]
	if in := net.Outlet.In; len(in) > 1 {
		d.Errorf(in[1].At("to"), "Several reaches end at the outlet",
			"reach %q and reach %q both end at outlet node %q; the outlet control applies to one reach. End them at a junction node and add one reach from there to the outlet.",
			in[0].Name, in[1].Name, net.Outlet.Name)
		return
	}
	net.OutletReach = net.Outlet.In[0]
	net.Order = postOrder(net.OutletReach, len(m.Reaches))
	for _, r := range m.Reaches {
		if len(r.Upstream) == 0 {
			net.Headwaters = append(net.Headwaters, r)
		}
	}
	for i := len(net.Order) - 1; i >= 0; i-- {
		r := net.Order[i]
		if r.HasInvert {
			continue
		}
		r.InvertDown = 0
		if r.Downstream != nil {
			r.InvertDown = r.Downstream.InvertUp
		}
		r.InvertUp = r.InvertDown + r.Slope*r.Length
		// Slopes and lengths that are each in range can still add up to
		// a fall no valley has: the derived inverts are elevations too.
		if most := MaxElevation.In(m.Units); math.Abs(r.InvertUp) > most {
			d.Errorf(r.At("slope"), "Elevation out of range",
				"reach %q rises to an upstream invert of %.6g%s (its downstream invert %.6g%s plus slope %g over its length %g%s); elevations lie within ±%g%s: the slopes and lengths of the reaches from the outlet up add to a fall greater than the Earth's relief. %s of the slopes and lengths, or give invert = [upstream, downstream] elevations.",
				r.Name, r.InvertUp, d.unitSuffix(), r.InvertDown, d.unitSuffix(), r.Slope, r.Length, d.unitSuffix(), most, d.unitSuffix(), fixUnits)
			return
		}
	}
	d.attachNodeLosses(nodes)
	m.Network = net
}

// cycles reports every loop of reaches once, at the `to` of the loop's
// first reach in file order. With at most one reach leaving each node, the
// reaches downstream of any reach form a single chain, so a loop is found by
// following that chain.
func (d *decoder) cycles() bool {
	const (
		unseen = iota
		onPath
		done
	)
	state := make([]int, len(d.m.Reaches))
	found := false
	for _, start := range d.m.Reaches {
		var path []*Reach
		r := start
		for r != nil && state[r.Index] == unseen {
			state[r.Index] = onPath
			path = append(path, r)
			r = r.Downstream
		}
		if r != nil && state[r.Index] == onPath {
			i := 0
			for path[i] != r {
				i++
			}
			loop := path[i:]
			first := loop[0]
			for _, x := range loop {
				if x.Index < first.Index {
					first = x
				}
			}
			names := make([]string, 0, len(loop)+1)
			for _, x := range loop {
				names = append(names, fmt.Sprintf("%q", x.Name))
			}
			names = append(names, names[0])
			d.Errorf(first.At("to"), "Reaches form a loop",
				"Following the flow, reaches %s come back to where they started; a channel network must be a tree. Change the to node of one of them.",
				strings.Join(names, " → "))
			found = true
		}
		for _, x := range path {
			state[x.Index] = done
		}
	}
	return found
}

// postOrder lists the reaches upstream of (and including) last so that each
// comes after every reach upstream of it; siblings keep file order.
func postOrder(last *Reach, n int) []*Reach {
	order := make([]*Reach, 0, n)
	type frame struct {
		r    *Reach
		next int
	}
	stack := []frame{{r: last}}
	for len(stack) > 0 {
		top := &stack[len(stack)-1]
		if top.next < len(top.r.Upstream) {
			up := top.r.Upstream[top.next]
			top.next++
			stack = append(stack, frame{r: up})
			continue
		}
		order = append(order, top.r)
		stack = stack[:len(stack)-1]
	}
	return order
}

// events checks each event's entrances and outlet control against the
// network and accumulates its discharges. It runs on a clean file, so every
// inflow and entrance names a reach.
func (d *decoder) events() {
	m := d.m
	net := m.Network
	for _, ev := range m.Events {
		what := ownerOf("event", ev.Name)
		own := make([]float64, len(m.Reaches))
		for _, in := range ev.Inflows {
			own[in.Reach.Index] += in.Discharge
		}
		for _, en := range ev.Entrances {
			if up := en.Reach.Upstream; len(up) > 0 {
				d.Errorf(en.Range, "Entrance on a reach with inflow from upstream",
					"reach %q receives the flow of reach %q, so its upstream depth comes from the junction; an entrance depth applies to headwater reaches only. Remove the entry.",
					en.ReachName, up[0].Name)
			} else if g := en.Reach.Gate; g != nil {
				d.Warnf(en.Range, "Entrance depth below a gate",
					"reach %q starts at gate %q, which controls the depth there; this entrance depth is not used. Remove it.", en.ReachName, g.Name)
			}
		}
		d.outletControl(ev, net.OutletReach, what)
		ev.Discharge = make([]float64, len(m.Reaches))
		for _, r := range net.Order {
			q := own[r.Index]
			for _, u := range r.Upstream {
				q += ev.Discharge[u.Index]
			}
			ev.Discharge[r.Index] = q
		}
		for _, r := range m.Reaches {
			dry := ev.Discharge[r.Index] == 0
			if dry && (r.Downstream == nil || ev.Discharge[r.Downstream.Index] > 0) {
				d.Errorf(ev.At("inflow"), "Reach receives no discharge",
					"In %s no water reaches reach %q; add an inflow to %q or to a reach upstream of it.", what, r.Name, r.Name)
			}
		}
	}
}

// outletControl checks an event's outlet control against the outlet reach.
func (d *decoder) outletControl(ev *Event, out *Reach, what owner) {
	switch ev.Outlet.Kind {
	case OutletElevation:
		if ev.Outlet.Value <= out.InvertDown {
			d.Errorf(ev.Outlet.Range, "Outlet level at or below the invert",
				"The outlet elevation of %s is %g, not above the downstream invert %g of reach %q; give a water-surface elevation above the invert, or a depth.",
				what, ev.Outlet.Value, out.InvertDown, out.Name)
		}
	case OutletNormal:
		if out.Slope <= 0 {
			d.Errorf(ev.Outlet.Range, "No normal depth at the outlet",
				"Outlet reach %q has a bed slope of %g, and normal depth exists only on a falling bed; use a depth, an elevation or condition = \"critical\".",
				out.Name, out.Slope)
		}
	}
}
