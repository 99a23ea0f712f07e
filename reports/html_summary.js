(function () {
  "use strict";
  var table = document.getElementById("ranked");
  var body = table.tBodies[0];
  var heads = table.tHead.rows[0].cells;
  function value(row, col, type) {
    var key = row.cells[col].getAttribute("data-sort");
    if (type === "number") { var n = parseFloat(key); return isNaN(n) ? -Infinity : n; }
    return key.toLowerCase();
  }
  function sortBy(col) {
    var th = heads[col], type = th.getAttribute("data-type");
    var dir = th.getAttribute("aria-sort") === "ascending" ? "descending" : "ascending";
    for (var k = 0; k < heads.length; k++) {
      if (heads[k].hasAttribute("aria-sort")) heads[k].setAttribute("aria-sort", "none");
    }
    th.setAttribute("aria-sort", dir);
    var rows = Array.prototype.slice.call(body.rows);
    rows.sort(function (a, b) {
      var x = value(a, col, type), y = value(b, col, type);
      var c = x < y ? -1 : x > y ? 1 : 0;
      if (c === 0) c = value(a, 0, "number") - value(b, 0, "number");
      return dir === "ascending" ? c : -c;
    });
    rows.forEach(function (row) { body.appendChild(row); });
    if (!document.getElementById("spectra-chart").hidden) draw();
  }
  Array.prototype.forEach.call(table.tHead.querySelectorAll("button"), function (button) {
    button.addEventListener("click", function () { sortBy(parseInt(button.getAttribute("data-col"), 10)); });
  });
  var form = document.querySelector(".filters");
  function checked(name) {
    return Array.prototype.filter.call(form.querySelectorAll("input[name=" + name + "]"), function (b) { return b.checked; })
      .map(function (b) { return b.value; });
  }
  function filter() {
    var groups = checked("group"), flags = checked("flag");
    var vendor = document.getElementById("f-vendor").value, basis = document.getElementById("f-basis").value;
    var text = document.getElementById("f-text").value.trim().toLowerCase();
    var shown = 0;
    Array.prototype.forEach.call(body.rows, function (row) {
      var own = (row.getAttribute("data-flags") || "").split(" ");
      var ok = groups.indexOf(row.getAttribute("data-group")) >= 0
        && flags.every(function (f) { return own.indexOf(f) >= 0; })
        && (!vendor || row.getAttribute("data-vendor") === vendor)
        && (!basis || row.getAttribute("data-basis") === basis)
        && (!text || row.cells[1].textContent.toLowerCase().indexOf(text) >= 0);
      row.hidden = !ok;
      if (ok) shown++;
    });
    document.getElementById("f-count").textContent = shown + " of " + body.rows.length + " products shown";
    if (!document.getElementById("spectra-chart").hidden) draw();
  }
  form.addEventListener("input", filter);
  form.addEventListener("change", filter);
  filter();
  var data = JSON.parse(document.getElementById("contributions").textContent);
  var chart = document.getElementById("spectra-chart"), pick = document.getElementById("spectra-hazard");
  function esc(text) {
    return String(text).replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
  }
  function tag(name, attrs, text) {
    var out = "<" + name;
    for (var k in attrs) out += " " + k + '="' + esc(attrs[k]) + '"';
    return out + ">" + (text === undefined ? "" : esc(text)) + "</" + name + ">";
  }
  function draw() {
    var symbol = pick.value, rows = [];
    Array.prototype.forEach.call(body.rows, function (row) {
      var c = (data[row.getAttribute("data-id")] || {})[symbol];
      if (!row.hidden && c) rows.push([row.getAttribute("data-id"), c]);
    });
    if (!rows.length) { chart.textContent = "No product shown here has a value for " + symbol + "."; return; }
    var lo = Infinity, hi = -Infinity;
    rows.forEach(function (r) { lo = Math.min(lo, r[1][0]); hi = Math.max(hi, r[1][0] + r[1][1] * r[1][2].length); });
    lo = Math.floor(lo / 50) * 50; hi = Math.ceil(hi / 50) * 50;
    var left = 130, width = 900, rowH = 18, plot = width - left - 10, height = rows.length * rowH + 30;
    var parts = [];
    function x(nm) { return (left + (nm - lo) / (hi - lo) * plot).toFixed(1); }
    var step = (hi - lo) > 1000 ? 200 : (hi - lo) > 400 ? 100 : 50;
    for (var nm = lo; nm <= hi; nm += step) {
      parts.push(tag("line", {x1: x(nm), x2: x(nm), y1: 0, y2: rows.length * rowH, stroke: "#D5DBE0"}));
      parts.push(tag("text", {x: x(nm), y: rows.length * rowH + 14, "text-anchor": "middle"}, nm));
    }
    parts.push(tag("text", {x: left + plot / 2, y: rows.length * rowH + 28, "text-anchor": "middle"}, "wavelength [nm]"));
    rows.forEach(function (r, i) {
      var c = r[1], top = i * rowH, biggest = Math.max.apply(null, c[2]) || 1;
      parts.push(tag("text", {x: 0, y: top + 13}, r[0]));
      c[2].forEach(function (share, k) {
        if (share <= 0) return;
        var h = share / biggest * (rowH - 3), x0 = x(c[0] + k * c[1]), x1 = x(c[0] + (k + 1) * c[1]);
        if (h < 0.3) return;  // under a third of a pixel: not drawn
        parts.push(tag("rect", {x: x0, y: (top + rowH - 1 - h).toFixed(1), width: Math.max(x1 - x0, 0.8).toFixed(1),
          height: h.toFixed(1), fill: "#1F2A36"}));
      });
    });
    var label = symbol + ": each product shown, its value split by wavelength band (" + lo + " to " + hi + " nm), each row scaled to its largest band";
    chart.innerHTML = tag("p", {}, label) + "<svg" + ' role="img" width="' + width + '" height="' + height + '" viewBox="0 0 ' + width + " " + height
      + '" aria-label="' + esc(label) + '">' + parts.join("") + "</svg>";
  }
  document.getElementById("spectra-show").addEventListener("click", function () {
    var open = chart.hidden;
    chart.hidden = !open;
    this.setAttribute("aria-expanded", String(open));
    this.textContent = open ? "Hide the chart" : "Show the chart";
    if (open) draw();
  });
  pick.addEventListener("change", function () { if (!chart.hidden) draw(); });
}());
