package calc

import (
	"fmt"
	"slices"
	"sort"
)

// Catalog is what the engine evaluates a site with: the kinds a block may
// name, the caution rules run over the evaluated blocks, and the site's
// settings for the models (materials, safety minimums), which the engine
// hands to them unopened.
type Catalog struct {
	kinds map[string]*Kind
	names []string // sorted
	rules []Rule
	env   any
}

// NewCatalog checks and collects the kinds and rules: names unique, every
// rule a caution can come from listed once, supersessions known.
func NewCatalog(kinds []*Kind, rules []Rule, env any) (*Catalog, error) {
	c := &Catalog{kinds: map[string]*Kind{}, rules: rules, env: env}
	for _, k := range kinds {
		if _, dup := c.kinds[k.Name]; dup || k.Name == "" {
			return nil, fmt.Errorf("kind %q registered twice or unnamed", k.Name)
		}
		c.kinds[k.Name] = k
		c.names = append(c.names, k.Name)
	}
	sort.Strings(c.names)
	seen := map[string]bool{}
	for _, r := range rules {
		if seen[r.ID] || r.ID == "" {
			return nil, fmt.Errorf("caution rule %q listed twice or unnamed", r.ID)
		}
		seen[r.ID] = true
	}
	for _, r := range rules {
		for _, s := range r.Supersedes {
			if !seen[s] {
				return nil, fmt.Errorf("caution rule %s supersedes unknown rule %q", r.ID, s)
			}
		}
	}
	for _, k := range kinds {
		for _, id := range k.Raises {
			if !seen[id] {
				return nil, fmt.Errorf("kind %s raises caution %q, which is not in the rule table", k.Name, id)
			}
		}
	}
	return c, nil
}

// Kind returns the kind named name.
func (c *Catalog) Kind(name string) (*Kind, bool) {
	k, ok := c.kinds[name]
	return k, ok
}

// KindNames lists the kinds, sorted.
func (c *Catalog) KindNames() []string { return c.names }

// KindsAccepted lists the kinds a Link or LinkList input may name, sorted.
func (c *Catalog) KindsAccepted(in InputSpec) []string {
	var names []string
	for _, n := range c.names {
		if in.Accepts(c.kinds[n]) {
			names = append(names, n)
		}
	}
	return names
}

// Rules lists the caution rules in the order they are applied.
func (c *Catalog) Rules() []Rule { return c.rules }

// RuleIDs lists the rule ids, sorted.
func (c *Catalog) RuleIDs() []string {
	ids := make([]string, len(c.rules))
	for i, r := range c.rules {
		ids[i] = r.ID
	}
	sort.Strings(ids)
	return ids
}

// Rule returns the rule with the given id.
func (c *Catalog) Rule(id string) (Rule, bool) {
	i := slices.IndexFunc(c.rules, func(r Rule) bool { return r.ID == id })
	if i < 0 {
		return Rule{}, false
	}
	return c.rules[i], true
}

// Env is the site settings the models read, as given to NewCatalog.
func (c *Catalog) Env() any { return c.env }
