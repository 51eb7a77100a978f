// specgen's site search: no outside service. The index (search-index.js,
// written by the build) is loaded the first time the reader types, with a
// script element, so that it works from file:// as from a web server.
(function () {
  "use strict";
  var form = document.querySelector("form.sg-search");
  if (!form) { return; } // a layout of the site's own without the search box
  var input = form.querySelector("input");
  var list = form.querySelector(".sg-search-results");
  var root = form.getAttribute("data-root") || "";
  var pages = null;
  var loading = false;

  window.specgenSearchIndex = function (entries) {
    pages = entries;
    show();
  };

  function load() {
    if (pages || loading) { return; }
    loading = true;
    var s = document.createElement("script");
    s.src = root + "assets/search-index.js";
    s.onerror = function () { say("The search index is missing; rebuild the site."); };
    document.head.appendChild(s);
  }

  function say(text) {
    list.textContent = "";
    var p = document.createElement("p");
    p.textContent = text;
    list.appendChild(p);
  }

  // score ranks a page for the query's terms, 0 when a term is missing:
  // a term in the title counts most, then in a heading, then in the text.
  function score(page, terms) {
    var title = page.t.toLowerCase();
    var heads = page.h.map(function (h) { return h[0].toLowerCase(); });
    var words = " " + page.w + " ";
    var total = 0;
    for (var i = 0; i < terms.length; i++) {
      var t = terms[i], s = 0;
      if (title.indexOf(t) >= 0) { s += 10; }
      for (var j = 0; j < heads.length; j++) { if (heads[j].indexOf(t) >= 0) { s += 4; break; } }
      if (words.indexOf(" " + t) >= 0) { s += 1; }
      if (s === 0) { return 0; }
      total += s;
    }
    return total;
  }

  // anchor is the first heading of the page that holds a term, for a link
  // straight to it.
  function anchor(page, terms) {
    for (var j = 0; j < page.h.length; j++) {
      var h = page.h[j][0].toLowerCase();
      for (var i = 0; i < terms.length; i++) {
        if (h.indexOf(terms[i]) >= 0) { return page.h[j]; }
      }
    }
    return null;
  }

  function show() {
    var q = input.value.toLowerCase().trim();
    list.textContent = "";
    if (!q) { return; }
    if (!pages) { load(); say("Loading the index …"); return; }
    var terms = q.split(/[^\p{L}\p{N}]+/u).filter(function (t) { return t; });
    var found = [];
    for (var i = 0; i < pages.length; i++) {
      var s = score(pages[i], terms);
      if (s > 0) { found.push({ page: pages[i], score: s }); }
    }
    found.sort(function (a, b) { return b.score - a.score; });
    if (found.length === 0) { say("No page holds all of: " + terms.join(" ")); return; }
    found.slice(0, 10).forEach(function (f) {
      var a = document.createElement("a");
      var h = anchor(f.page, terms);
      a.href = root + f.page.u + (h ? "#" + h[1] : "");
      var title = document.createElement("strong");
      title.textContent = f.page.t + (h ? " › " + h[0] : "");
      var text = document.createElement("span");
      text.textContent = f.page.x;
      a.appendChild(title);
      a.appendChild(text);
      var li = document.createElement("li");
      li.appendChild(a);
      list.appendChild(li);
    });
  }

  form.hidden = false;
  input.addEventListener("focus", load);
  input.addEventListener("input", show);
  input.addEventListener("keydown", function (e) {
    if (e.key === "Escape") { input.value = ""; show(); }
  });
  form.addEventListener("submit", function (e) {
    e.preventDefault();
    var first = list.querySelector("a");
    if (first) { window.location.href = first.href; }
  });
})();
