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
