package site

// Session builds one site into memory again and again, each build taking
// over from the last good one every file whose inputs have not changed and
// every model outcome whose inputs have not: the preview's builds.
type Session struct {
	root     string
	outcomes *outcomeStore
	files    map[string][]byte // the last good build's
	record   *buildRecord      // what they were made from
}

// NewSession starts a session on the site at root.
func NewSession(root string) *Session { return &Session{root: root} }

// Build builds the site into memory and returns every output file, keyed
// by output path, and the home page's path. After a failed build the last
// good one stays what the next starts from.
func (se *Session) Build() (files map[string][]byte, home string, err error) {
	if ns, err := outcomesNamespace(se.root); err != nil {
		se.outcomes = nil
	} else if se.outcomes == nil || se.outcomes.namespace != ns {
		se.outcomes = newOutcomeStore(ns)
	}
	s, err := load(se.root, storeOrNil(se.outcomes), se.record != nil)
	if err != nil {
		return nil, "", err
	}
	files, record, err := s.renderFiles(se.files, se.record, true)
	if err != nil {
		return nil, "", err
	}
	if se.outcomes != nil {
		se.outcomes.next()
	}
	se.files, se.record = files, record
	return files, s.Home(), nil
}
