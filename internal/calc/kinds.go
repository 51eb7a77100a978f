package calc

import "sort"

// kinds is every model specgen knows, by block `kind`.
var kinds = map[string]*Kind{
	compressorKind.Name: &compressorKind,
	boltsKind.Name:      &boltsKind,
	tankKind.Name:       &tankKind,
	valveKind.Name:      &valveKind,
	tubeKind.Name:       &tubeKind,
	vacuumKind.Name:     &vacuumKind,
	multistageKind.Name: &multistageKind,
	flywheelKind.Name:   &flywheelKind,
	balanceKind.Name:    &balanceKind,
	motorKind.Name:      &motorKind,
}

// LookupKind returns the kind named name.
func LookupKind(name string) (*Kind, bool) {
	k, ok := kinds[name]
	return k, ok
}

// KindNames lists the kinds, sorted.
func KindNames() []string {
	names := make([]string, 0, len(kinds))
	for n := range kinds {
		names = append(names, n)
	}
	sort.Strings(names)
	return names
}

// input returns the kind's input spec named name.
func (k *Kind) input(name string) (InputSpec, bool) {
	for _, in := range k.Inputs {
		if in.Name == name {
			return in, true
		}
	}
	return InputSpec{}, false
}

// ResultSpec returns the kind's result spec named name.
func (k *Kind) ResultSpec(name string) (ResultSpec, bool) { return k.result(name) }

// resultMeaning is a result's one-line meaning, which says when an
// optional result is computed.
func (k *Kind) resultMeaning(name string) string {
	r, _ := k.result(name)
	return r.Meaning
}

// result returns the kind's result spec named name.
func (k *Kind) result(name string) (ResultSpec, bool) {
	for _, r := range k.Results {
		if r.Name == name {
			return r, true
		}
	}
	return ResultSpec{}, false
}

func (k *Kind) inputNames() []string {
	names := make([]string, len(k.Inputs))
	for i, in := range k.Inputs {
		names[i] = in.Name
	}
	return names
}

func (k *Kind) resultNames() []string {
	names := make([]string, len(k.Results))
	for i, r := range k.Results {
		names[i] = r.Name
	}
	return names
}
