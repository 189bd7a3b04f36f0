// skysheet site script: sorting and filtering of material tables. Without
// it the tables are plain and complete.
(function () {
  "use strict";
  document.documentElement.classList.add("js");

  function cellValue(row, key) {
    var cell = row.querySelector('[data-key="' + key + '"]');
    return cell ? cell.getAttribute("data-value") : "";
  }

  function compare(a, b) {
    var empty = function (v) { return v === null || v === ""; };
    if (empty(a) || empty(b)) { return empty(a) === empty(b) ? 0 : (empty(a) ? 1 : -1); }
    var x = parseFloat(a), y = parseFloat(b);
    if (!isNaN(x) && !isNaN(y) && String(x) !== "NaN") { return x - y; }
    return a.toLowerCase().localeCompare(b.toLowerCase());
  }

  function setUpSorting(table) {
    var tbody = table.tBodies[0];
    var buttons = table.querySelectorAll("button[data-sort-key]");
    Array.prototype.forEach.call(buttons, function (btn) {
      btn.addEventListener("click", function () {
        var key = btn.getAttribute("data-sort-key");
        var th = btn.parentNode;
        var dir = th.getAttribute("aria-sort") === "ascending" ? "descending" : "ascending";
        Array.prototype.forEach.call(table.querySelectorAll("th[aria-sort]"), function (h) { h.removeAttribute("aria-sort"); });
        th.setAttribute("aria-sort", dir);
        var rows = Array.prototype.slice.call(tbody.rows);
        rows.sort(function (r1, r2) {
          var a = cellValue(r1, key), b = cellValue(r2, key);
          var empties = (a === "" ? 1 : 0) - (b === "" ? 1 : 0);
          if (empties !== 0) { return empties; } // missing values last either way
          var c = compare(a, b);
          return dir === "ascending" ? c : -c;
        });
        rows.forEach(function (r) { tbody.appendChild(r); });
      });
    });
  }

  function setUpFilter(table, input) {
    var tools = input.closest(".table-tools");
    var count = tools ? tools.querySelector(".filter-count") : null;
    var rows = Array.prototype.slice.call(table.tBodies[0].rows);
    var points = document.querySelectorAll("#library-scatter a[data-slug]");
    if (tools) { tools.hidden = false; }
    function apply() {
      var terms = input.value.toLowerCase().split(/\s+/).filter(Boolean);
      var shown = {}, n = 0;
      rows.forEach(function (row) {
        var text = row.textContent.toLowerCase();
        var ok = terms.every(function (t) { return text.indexOf(t) >= 0; });
        row.hidden = !ok;
        if (ok) { n++; shown[row.getAttribute("data-slug")] = true; }
      });
      Array.prototype.forEach.call(points, function (p) {
        p.classList.toggle("dim", !shown[p.getAttribute("data-slug")]);
      });
      if (count) { count.textContent = terms.length ? n + " of " + rows.length + " shown" : ""; }
    }
    input.addEventListener("input", apply);
    apply();
  }

  Array.prototype.forEach.call(document.querySelectorAll("table.materials"), setUpSorting);
  var table = document.getElementById("library-table");
  var input = document.getElementById("library-filter");
  if (table && input) { setUpFilter(table, input); }
})();

// Library-wide search: the box in the masthead of every page loads the
// search index (search.js at the site's root, a script so that it loads
// from file:// too) when first used and lists the materials whose title,
// maker, lab, product code, category, tags or notes hold every word typed.
(function () {
  "use strict";
  var form = document.querySelector("form.site-search");
  if (!form) { return; }
  var input = form.querySelector("input");
  var list = form.querySelector(".search-results");
  var count = form.querySelector(".search-count");
  var root = form.getAttribute("data-root") || "";
  var index = null, loading = false, max = 20;
  form.hidden = false;

  function load() {
    if (index || loading) { return; }
    loading = true;
    var s = document.createElement("script");
    s.src = root + "search.js";
    s.onload = function () {
      index = (window.skysheetSearchIndex || []).map(function (e) {
        return { slug: e[0], title: e[1], who: e[2], text: (e[1] + " " + e[2] + " " + e[3]).toLowerCase() };
      });
      show();
    };
    s.onerror = function () { count.textContent = "The search index could not be loaded."; };
    document.head.appendChild(s);
  }

  function show() {
    var terms = input.value.toLowerCase().split(/\s+/).filter(Boolean);
    list.textContent = "";
    if (!terms.length) { list.hidden = true; count.textContent = ""; return; }
    if (!index) { load(); return; }
    var hits = index.filter(function (e) {
      return terms.every(function (t) { return e.text.indexOf(t) >= 0; });
    });
    // Materials whose title or maker hold every word first, each group in
    // library order.
    hits.forEach(function (e, i) {
      var name = (e.title + " " + e.who).toLowerCase();
      e.rank = (terms.every(function (t) { return name.indexOf(t) >= 0; }) ? 0 : 1) * 1e6 + i;
    });
    hits.sort(function (a, b) { return a.rank - b.rank; });
    hits.slice(0, max).forEach(function (e) {
      var li = document.createElement("li");
      var a = document.createElement("a");
      a.href = root + "m/" + e.slug + "/index.html";
      a.setAttribute("data-slug", e.slug);
      a.textContent = e.title;
      li.appendChild(a);
      if (e.who) {
        var who = document.createElement("span");
        who.className = "sub";
        who.textContent = e.who;
        li.appendChild(who);
      }
      list.appendChild(li);
    });
    list.hidden = hits.length === 0;
    count.textContent = hits.length === 0 ? "No material matches." :
      hits.length + (hits.length === 1 ? " material matches" : " materials match") +
      (hits.length > max ? "; the first " + max + " are listed." : ".");
  }

  input.addEventListener("focus", load);
  input.addEventListener("input", show);
  input.addEventListener("keydown", function (ev) {
    if (ev.key === "Escape") { input.value = ""; show(); }
  });
  form.addEventListener("submit", function (ev) {
    ev.preventDefault();
    var first = list.querySelector("a");
    if (first) { window.location.href = first.href; }
  });
})();
