package calc

import (
	"strings"

	"github.com/millrace-workshop/specgen/internal/inputerr"
)

// phase is a step in evaluating a block. A reference waits only for the
// step that gives what it names, so that two blocks may refer to each other
// as long as no value waits on itself.
type phase int

const (
	// early computes the results a kind gives without its links
	// (ResultSpec.WithoutLinks), for a block whose such results another
	// block quotes.
	early phase = iota
	// full reads every input and runs the model.
	full
	// derived computes the block's [derive] expressions.
	derived
)

// step is one phase of one block.
type step struct {
	id    string
	phase phase
}

// dependency is a step that another waits on, with the key and line of the
// reference that makes it wait, for messages.
type dependency struct {
	step
	key  string
	line int
}

// plan is the order in which the steps of a site run.
type plan struct {
	// levels: the steps of a level depend only on steps of earlier levels,
	// so each level runs in parallel.
	levels [][]step
	// early lists the blocks that have an early step.
	early map[string]bool
	byID  map[string]*Block
}

// makePlan orders the steps of the blocks byID (ids sorted), or reports
// the first circle of references it finds, with the ids of its blocks.
func makePlan(byID map[string]*Block, ids []string) (*plan, []string, error) {
	p := &plan{early: map[string]bool{}, byID: byID}
	for _, id := range ids {
		for _, v := range byID[id].Values {
			if v.RefBlock == "" {
				continue
			}
			if spec, ok := byID[v.RefBlock].Kind.ResultSpec(v.RefResult); ok && spec.WithoutLinks {
				p.early[v.RefBlock] = true
			}
		}
	}
	const (
		unseen = iota
		active
		done
	)
	state := map[step]int{}
	depth := map[step]int{}
	var stack []step
	var via []string // the key by which each step of stack was entered
	var inCircle []string
	circle := func(closing dependency) error {
		start := 0
		for i, s := range stack {
			if s == closing.step {
				start = i
			}
		}
		var names []string
		for i, s := range stack[start:] {
			out := closing.key
			if start+i+1 < len(stack) {
				out = via[start+i+1]
			}
			names = append(names, stepLabel(s, out))
		}
		names = append(names, names[0])
		for _, s := range stack[start:] {
			inCircle = append(inCircle, s.id)
		}
		b := byID[stack[len(stack)-1].id]
		return inputerr.List{{File: b.File, Line: closing.line, Key: closing.key,
			Msg: "references go round in a circle: " + strings.Join(names, " → ") + "; break the circle by giving one value directly"}}
	}
	var visit func(st step, key string) error
	visit = func(st step, key string) error {
		via = append(via, key)
		state[st] = active
		stack = append(stack, st)
		d := 0
		for _, dep := range p.deps(st) {
			switch state[dep.step] {
			case active:
				return circle(dep)
			case unseen:
				if err := visit(dep.step, dep.key); err != nil {
					return err
				}
			}
			d = max(d, depth[dep.step]+1)
		}
		stack, via = stack[:len(stack)-1], via[:len(via)-1]
		state[st] = done
		depth[st] = d
		for len(p.levels) <= d {
			p.levels = append(p.levels, nil)
		}
		p.levels[d] = append(p.levels[d], st)
		return nil
	}
	for _, id := range ids {
		for _, ph := range []phase{early, full, derived} {
			st := step{id, ph}
			if (ph == early && !p.early[id]) || (ph == derived && len(byID[id].Derive) == 0) || state[st] != unseen {
				continue
			}
			if err := visit(st, ""); err != nil {
				return nil, inCircle, err
			}
		}
	}
	return p, nil, nil
}

// deps lists the steps st waits on, in the order of the block's keys: the
// steps that give the values it quotes and, for the full step, the blocks
// it links to and its own early step.
func (p *plan) deps(st step) []dependency {
	b := p.byID[st.id]
	var out []dependency
	if st.phase == derived {
		out = append(out, dependency{step{st.id, full}, "", b.Line})
		for _, d := range b.Derive {
			for _, r := range d.Expr.Refs() {
				if r.Block != "" {
					out = append(out, dependency{p.valueStep(r.Block, r.Name), "derive." + d.Name, d.Line})
				}
			}
		}
		return out
	}
	for _, v := range b.Values {
		key := v.Key
		if v.RefBlock != "" {
			out = append(out, dependency{p.quoted(v), key, v.Line})
			continue
		}
		if st.phase == full {
			for _, id := range v.Links {
				out = append(out, dependency{step{id, full}, key, v.Line})
			}
		}
	}
	if st.phase == full && p.early[st.id] {
		out = append(out, dependency{step{st.id, early}, "", b.Line})
	}
	return out
}

// quoted is the step whose outcome a quote "=id.name" reads.
func (p *plan) quoted(v Value) step { return p.valueStep(v.RefBlock, v.RefResult) }

// valueStep is the step that gives block id's value name: its derived
// step for a derived result, its early step for a result the kind gives
// without links (when the block has one), else its full step.
func (p *plan) valueStep(id, name string) step {
	b := p.byID[id]
	if _, ok := b.derivation(name); ok {
		return step{id, derived}
	}
	if p.early[id] {
		if spec, ok := b.Kind.ResultSpec(name); ok && spec.WithoutLinks {
			return step{id, early}
		}
	}
	return step{id, full}
}

// stepLabel names a step in a circle of references: its block, or for a
// derived step the derived result (leaving by key "derive.NAME") that
// leads on.
func stepLabel(s step, key string) string {
	if name, ok := strings.CutPrefix(key, "derive."); ok && s.phase == derived {
		return s.id + "." + name
	}
	return s.id
}
