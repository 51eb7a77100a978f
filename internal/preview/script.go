package preview

import (
	"bytes"
	"html"
	"strconv"
)

// The preview's own URLs; no site file can have these names, since a
// site's files never start with "_specgen". The script and the overlay's
// style are files rather than inline, so that the Content-Security-Policy
// can refuse every inline script and style.
const (
	scriptPath = "/_specgen/reload.js"
	stylePath  = "/_specgen/preview.css"
	eventsPath = "/_specgen/events"
)

// overlayID is the element that shows a failed build's error.
const overlayID = "sg-preview-error"

// reloadScript reloads the page when the site is rebuilt and shows a
// build error over the page. It is served only by preview, never built.
const reloadScript = `(function () {
  var box = null;
  function show(msg) {
    box = box || document.getElementById("` + overlayID + `");
    if (!box) {
      box = document.createElement("div");
      box.id = "` + overlayID + `";
      box.setAttribute("role", "alert");
      document.body.appendChild(box);
    }
    box.textContent = "specgen preview: the build failed; showing the last good site.\n\n" + msg;
  }
  var es = new EventSource("` + eventsPath + `");
  var built = (document.currentScript && document.currentScript.dataset.build) || "";
  es.addEventListener("reload", function () { location.reload(); });
  // On connecting, the server names its latest good build: a page served
  // before it (an edit while this page was loading) reloads at once.
  es.addEventListener("hello", function (e) { if (built && e.data !== built) { location.reload(); } });
  es.addEventListener("failed", function (e) { show(e.data); });
})();
`

// overlayStyle places the error overlay over the bottom of the page.
const overlayStyle = `#` + overlayID + ` {
  position: fixed; inset: auto 1rem 1rem 1rem; max-height: 60vh; overflow: auto; z-index: 9999;
  background: #fff; color: #111; border: 3px solid #b3261e; padding: 1rem;
  font: 14px/1.45 ui-monospace, monospace; white-space: pre-wrap; box-shadow: 0 4px 16px rgba(0, 0, 0, .3);
}
`

// injectReload adds the overlay's style and the reload script, and the
// error overlay when the last build failed, before </body>.
func injectReload(page []byte, buildErr error, build int) []byte {
	extra := `<link rel="stylesheet" href="` + stylePath + `"><script src="` + scriptPath + `" data-build="` + strconv.Itoa(build) + `"></script>`
	if buildErr != nil {
		extra = `<div id="` + overlayID + `" role="alert">specgen preview: the build failed; showing the last good site.` +
			"\n\n" + html.EscapeString(buildErr.Error()) + `</div>` + extra
	}
	i := bytes.LastIndex(page, []byte("</body>"))
	if i < 0 {
		return append(append([]byte{}, page...), extra...)
	}
	out := make([]byte, 0, len(page)+len(extra))
	out = append(out, page[:i]...)
	out = append(out, extra...)
	return append(out, page[i:]...)
}

// errorPage is shown when there has never been a good build.
func errorPage(err error) []byte {
	return []byte(`<!DOCTYPE html><html lang="en"><head><meta charset="utf-8"><title>Build failed</title></head><body>` +
		`<h1>specgen preview: the build failed</h1><pre>` + html.EscapeString(err.Error()) + `</pre>` +
		`<link rel="stylesheet" href="` + stylePath + `"><script src="` + scriptPath + `"></script></body></html>`)
}
