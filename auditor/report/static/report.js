/* Corpus Auditor report: filters, search, sort and evidence panels over the question table.
   Safety rule: text from the run only ever reaches the page through textContent / createTextNode;
   nothing here assigns innerHTML. Data comes from the JSON block, parsed with JSON.parse.

   The table shows the rows that match the filters in the chosen order, PAGE rows at a time. Rows
   0 .. data.server_rows-1 are written as HTML by the server (readable without JavaScript); the
   others are built here from data.x when first shown. */
(function () {
  "use strict";
  var PAGE = 500;
  var dataEl = document.getElementById("report-data");
  var table = document.getElementById("questions");
  if (!dataEl || !table) { return; }
  var data = JSON.parse(dataEl.textContent);
  var n = data.q.length, serverRows = data.server_rows;
  var tbody = table.tBodies[0];
  var rows = Array.prototype.slice.call(tbody.rows); // rows[i] belongs to data.q[i], once it exists
  var detailRows = []; // detailRows[i]: the evidence row under rows[i], once built
  var form = document.getElementById("filters");
  var fVerdict = document.getElementById("f-verdict");
  var fOwner = document.getElementById("f-owner");
  var fTopic = document.getElementById("f-topic");
  var fText = document.getElementById("f-text");
  var shown = document.getElementById("shown");
  var more = document.getElementById("more");
  var owners = [], topics = [];
  Array.prototype.forEach.call(fOwner.options, function (o) { if (o.value !== "") { owners[+o.value] = o.text; } });
  Array.prototype.forEach.call(fTopic.options, function (o) { if (+o.value >= 0 && o.value !== "") { topics[+o.value] = o.text; } });
  var order = [];  // every question index, in the chosen sort order
  for (var k = 0; k < n; k++) { order.push(k); }
  var matches = order, limit = PAGE, hay = null;

  function el(tag, cls, text) {
    var e = document.createElement(tag);
    if (cls) { e.className = cls; }
    if (text !== undefined && text !== null) { e.textContent = String(text); }
    return e;
  }
  function extra(i) { return data.x[i - serverRows]; }
  function questionText(i) {
    return i < serverRows ? rows[i].cells[0].querySelector("summary").textContent : extra(i).id + " " + extra(i).q;
  }
  function questionOnly(i) {  // the question without its id, for sorting
    return i < serverRows ? rows[i].cells[0].querySelector("summary").lastChild.textContent.trim() : extra(i).q;
  }
  function actionOf(i) { return i < serverRows ? rows[i].cells[6].textContent : (extra(i).a || ""); }
  function num(x, digits) {
    if (x === null || x === undefined) { return "–"; }
    return x === Math.round(x) ? String(x) : (+x).toFixed(digits);
  }

  // A row the server did not write, built like the template's rows.
  function buildRow(i) {
    var q = data.q[i], x = extra(i);
    var verdict = (data.V || []).indexOf(q.v) !== -1 ? q.v : "other";
    var tr = el("tr");
    tr.id = "q" + i;
    tr.setAttribute("role", "row");
    function cell() { var td = tr.insertCell(); td.setAttribute("role", "cell"); return td; }
    var details = el("details"), summary = el("summary"), why = el("div", "why");
    summary.appendChild(el("span", "qid", x.id));
    summary.appendChild(document.createTextNode(" " + x.q));
    details.appendChild(summary);
    why.appendChild(el("p", null, x.y));
    if (x.xc) {  // the question file's own columns, [name, value] pairs
      var kept = el("dl", "kv extra");
      x.xc.forEach(function (kv) {
        var d = el("div"); d.appendChild(el("dt", null, kv[0])); d.appendChild(el("dd", null, kv[1])); kept.appendChild(d);
      });
      why.appendChild(kept);
    }
    if (x.ac) { why.appendChild(el("p", "act", x.ac)); }
    if (x.m) {
      var miss = el("p", null, "Never used in the corpus: ");
      x.m.forEach(function (t) { miss.appendChild(el("span", "chip miss", t)); });
      why.appendChild(miss);
    }
    if (x.f) {
      var ul = el("ul", "flags");
      x.f.forEach(function (f) {
        var li = el("li"); li.appendChild(el("span", "chip", f[0]));
        li.appendChild(document.createTextNode(" " + f[1])); ul.appendChild(li);
      });
      why.appendChild(ul);
    }
    if (x.b) { why.appendChild(el("p", "best", x.b)); }
    details.appendChild(why);
    cell().appendChild(details);
    cell().textContent = owners[q.o];
    cell().textContent = q.t >= 0 ? topics[q.t] : "";
    cell().textContent = num(q.w, 2);
    var vc = cell();
    var badge = el("span", "v v-" + verdict);
    var glyph = el("span", "glyph", (data.G || {})[q.v] || "\u2022");
    glyph.setAttribute("aria-hidden", "true");
    badge.appendChild(glyph);
    badge.appendChild(document.createTextNode(" " + q.v));
    vc.appendChild(badge);
    (x.f || []).forEach(function (f) { vc.appendChild(document.createTextNode(" ")); vc.appendChild(el("span", "flag", f[0])); });
    cell().textContent = num(q.s, 3);
    var ac = cell();
    if (x.a) { ac.appendChild(el("span", "a a-" + (({ write: 1, refresh: 1, retire: 1 })[x.a] ? x.a : "other"), x.a)); }
    return tr;
  }
  function rowOf(i) { return rows[i] || (rows[i] = buildRow(i)); }

  function render() {
    var frag = document.createDocumentFragment();
    var count = Math.min(limit, matches.length);
    for (var j = 0; j < count; j++) {
      var i = matches[j];
      frag.appendChild(rowOf(i));
      if (detailRows[i] && rows[i].classList.contains("open")) { frag.appendChild(detailRows[i]); }
    }
    tbody.replaceChildren(frag);
    shown.textContent = matches.length + " of " + n + " questions shown" +
      (count < matches.length ? " (the first " + count + " listed)" : "");
    more.hidden = count >= matches.length;
  }

  function haystack() {
    if (hay === null) {
      hay = [];
      for (var i = 0; i < n; i++) {
        var q = data.q[i];
        hay.push((questionText(i) + " " + owners[q.o] + " " + (q.t >= 0 ? topics[q.t] : "")).toLowerCase());
      }
    }
    return hay;
  }

  function apply() {
    var v = fVerdict.value, o = fOwner.value, t = fTopic.value;
    var s = fText.value.trim().toLowerCase();
    var words = s ? haystack() : null;
    var oi = o === "" ? null : +o, ti = t === "" ? null : +t;
    matches = order.filter(function (i) {
      var q = data.q[i];
      return (!v || q.v === v) && (oi === null || q.o === oi) && (ti === null || q.t === ti) &&
             (!s || words[i].indexOf(s) !== -1);
    });
    limit = PAGE;
    render();
  }

  // --- sort ---------------------------------------------------------------------------------
  var collator = new Intl.Collator(undefined, { sensitivity: "base", numeric: true });
  // Worst first: the reverse of the verdict order of auditor/models.py VERDICTS (data.V).
  var verdictRank = {};
  (data.V || []).forEach(function (v, k) { verdictRank[v] = (data.V.length - 1) - k; });
  var actionRank = { write: 0, retire: 1, refresh: 2 };
  function keyOf(col, i) {
    var q = data.q[i];
    switch (col) {
      case "weight": return +q.w || 0;
      case "support": return q.s === null || q.s === undefined ? -1 : +q.s;
      case "verdict": return verdictRank.hasOwnProperty(q.v) ? verdictRank[q.v] : 9;
      case "owner": return owners[q.o] || "";
      case "topic": return q.t >= 0 ? topics[q.t] : "";
      case "action": var a = actionOf(i); return actionRank.hasOwnProperty(a) ? actionRank[a] : 9;
      default: return questionOnly(i);
    }
  }
  var sortState = { col: null, dir: 1 };
  function sortBy(th) {
    var col = th.getAttribute("data-sort");
    var dir = sortState.col === col ? -sortState.dir : (col === "weight" ? -1 : 1);
    sortState = { col: col, dir: dir };
    var keys = [];
    for (var i = 0; i < n; i++) { keys.push(keyOf(col, i)); }
    order = order.slice().sort(function (a, b) {
      var ka = keys[a], kb = keys[b];
      var c = typeof ka === "number" ? ka - kb : collator.compare(ka, kb);
      return c !== 0 ? c * dir : a - b;
    });
    Array.prototype.forEach.call(table.tHead.rows[0].cells, function (c) {
      if (c === th) { c.setAttribute("aria-sort", dir > 0 ? "ascending" : "descending"); }
      else if (c.hasAttribute("data-sort")) { c.setAttribute("aria-sort", "none"); }
    });
    apply();
  }
  Array.prototype.forEach.call(table.tHead.rows[0].cells, function (th) {
    if (!th.hasAttribute("data-sort")) { return; }
    th.classList.add("sortable");
    th.tabIndex = 0;
    th.setAttribute("aria-sort", "none");
    th.title = "Sort by " + th.textContent.toLowerCase();
    th.addEventListener("click", function () { sortBy(th); });
    th.addEventListener("keydown", function (ev) {
      if (ev.key === "Enter" || ev.key === " ") { ev.preventDefault(); sortBy(th); }
    });
  });

  // --- evidence panels ------------------------------------------------------------------------
  var REASONS = { too_old: "older than the horizon", expired: "expired", overtaken: "overtaken by events" };
  var SOURCES = { statement: "a dated statement in the passage", metadata: "the document's metadata",
                  file: "the file's modification time only", none: "no date" };

  // Highlights are delta-coded: [gap, length, gap, length, ...], each gap from the previous end.
  function highlighted(text, coded) {
    var box = el("blockquote", "passage");
    var at = 0, end = 0;
    for (var k = 0; k + 1 < coded.length; k += 2) {
      var s = end + coded[k], e = s + coded[k + 1];
      end = e;
      if (s < at || e > text.length) { continue; }
      if (s > at) { box.appendChild(document.createTextNode(text.slice(at, s))); }
      box.appendChild(el("mark", null, text.slice(s, e)));
      at = e;
    }
    if (at < text.length) { box.appendChild(document.createTextNode(text.slice(at))); }
    return box;
  }

  // Evidence items are arrays: [passage key, rank, score, support, supporting, fresh, reasons,
  // contribution of each of the question's terms q.k, highlights] (see html._page_data).
  function ageDays(isoDate) {
    var a = Date.parse(data.audit), b = Date.parse(isoDate);
    return isNaN(a) || isNaN(b) ? null : Math.round((a - b) / 86400000);
  }

  // The horizon an item was judged with, named with where it came from (e[11] indexes data.H);
  // runs stored before horizons were named give only the days.
  function horizonName(e, horizon) {
    return (e[11] !== undefined && e[11] >= 0 && data.H) ? data.H[e[11]] : "the " + horizon + "-day horizon";
  }

  function freshnessWhy(p, e, horizon) {
    var fresh = e[5] === 1, parts = [], named = horizonName(e, horizon);
    var days = +(/(\d+)-day/.exec(named) || [0, horizon])[1];
    var reasons = e[6].map(function (k) { return data.R[k]; });
    if (p.ao) {
      var s = "As of " + p.ao + " (from " + (SOURCES[p.src] || p.src || "an unknown source") + ")";
      var age = ageDays(p.ao);
      if (age !== null) {
        s += ", " + age + " days before the audit date — " + (age <= days ? "within " : "beyond ") + named;
      }
      parts.push(s + ".");
    } else {
      parts.push("No date found for this passage.");
    }
    if (p.ex) { parts.push("Valid until " + p.ex + (reasons.indexOf("expired") !== -1 ? ", before the audit date." : ".")); }
    if (reasons.indexOf("overtaken") !== -1) { parts.push("It announces a planned event whose date has passed."); }
    parts.push(fresh ? "Fresh." : "Stale: " + reasons.map(function (r) {
      return r === "too_old" ? "older than " + named : (REASONS[r] || r);
    }).join(", ") + ".");
    return parts.join(" ");
  }

  function evidenceItem(e, q) {
    var p = data.p[e[0]] || {}, horizon = q.h || data.h, signalNames = q.sk || data.sk || [];
    var ok = e[4] === 1, fresh = e[5] === 1, ranges = e[8] || [];
    var terms = q.k.map(function (t, k) { return [t, e[7][k]]; })
      .filter(function (x) { return x[1] > 0; })
      .sort(function (a, b) { return b[1] - a[1] || (a[0] < b[0] ? -1 : 1); });
    var box = el("article", "ev");
    var where = (p.d || "") + (p.sec ? " › " + p.sec : "") + (p.pg ? " (p. " + p.pg + ")" : "");
    box.appendChild(el("h4", null, "#" + e[1] + " " + where));
    var line = el("p", "meta");
    line.appendChild(el("span", "state " + (!ok ? "unsup" : (fresh ? "fresh" : "stale")),
                        !ok ? "not supporting" : (fresh ? "fresh support" : "stale support")));
    line.appendChild(document.createTextNode(" support " + (+e[3]).toFixed(3) + " · BM25 " + (+e[2]).toFixed(2)));
    box.appendChild(line);
    var grid = el("div", "ev-grid");
    var text = el("div");
    text.appendChild(highlighted(p.txt || "", ranges));
    if (p.cut) { text.appendChild(el("p", "hint", "Text shortened here; results.json has the full passage.")); }
    grid.appendChild(text);
    var left = el("div");
    var t = el("table", "bd");
    t.appendChild(el("caption", "sr", "Score breakdown by term"));
    var head = t.createTHead().insertRow();
    ["term", "BM25", "relative"].forEach(function (h) { head.appendChild(el("th", null, h)); });
    var tb = t.createTBody();
    var top = terms.length ? Math.max.apply(null, terms.map(function (x) { return x[1]; })) : 0;
    terms.forEach(function (x) {
      var r = tb.insertRow();
      r.insertCell().appendChild(el("span", "chip", x[0]));
      var c = r.insertCell(); c.textContent = (+x[1]).toFixed(2); c.className = "n";
      var bar = el("div", "bar"); bar.style.width = (top > 0 ? Math.round(100 * x[1] / top) : 0) + "%";
      r.insertCell().appendChild(bar);
    });
    if (!terms.length) { tb.insertRow().insertCell().textContent = "no question term in this passage"; }
    left.appendChild(t);
    var sig = e[9] || [];
    if (signalNames.length && sig.length) {
      var sl = el("p", "signals");
      sl.appendChild(el("span", "sr", "Support signals: "));
      signalNames.forEach(function (name, k) {
        var chip = el("span", "sig");
        chip.appendChild(el("b", null, name));
        chip.appendChild(document.createTextNode(" " + (+sig[k]).toFixed(2)));
        sl.appendChild(chip);
      });
      left.appendChild(sl);
    }
    if (q.at && e[10] !== null && e[10] !== undefined) {
      left.appendChild(el("p", "hint", e[10] ? "Has the kind of answer asked for (" + q.at + ")."
        : "Lacks the kind of answer asked for (" + q.at + "): support lowered."));
    }
    grid.appendChild(left);
    var right = el("div");
    var st = el("table", "st");
    st.appendChild(el("caption", "sr", "Dated statements with their roles"));
    var sh = st.createTHead().insertRow();
    ["dated statement", "role", "interval"].forEach(function (h) { sh.appendChild(el("th", null, h)); });
    var sb = st.createTBody();
    (p.st || []).forEach(function (x) {
      var r = sb.insertRow();
      r.insertCell().textContent = x[0];
      r.insertCell().appendChild(el("span", "chip", x[1]));
      var iv = r.insertCell();
      iv.textContent = x[2] === x[3] ? x[2] : x[2] + " – " + x[3];
      if (x[4]) { iv.appendChild(document.createTextNode(" ")); iv.appendChild(el("span", "gran", x[4])); }
    });
    if (!(p.st || []).length) { sb.insertRow().insertCell().textContent = "no dated statements"; }
    right.appendChild(st);
    right.appendChild(el("p", "fw", freshnessWhy(p, e, horizon)));
    grid.appendChild(right);
    box.appendChild(grid);
    return box;
  }

  // The evidence of row i goes into a full-width row right below it, built on first opening.
  var ncols = table.tHead.rows[0].cells.length;
  function rowIndex(details) {
    var tr = details.closest("tr");
    return tr && tr.id.charAt(0) === "q" ? +tr.id.slice(1) : -1;
  }
  function openEvidence(details) {
    var i = rowIndex(details);
    if (i < 0) { return; }
    var tr = detailRows[i];
    if (!tr) {
      var q = data.q[i];
      tr = detailRows[i] = el("tr", "ev-row");
      tr.setAttribute("role", "row");
      var td = tr.insertCell();
      td.colSpan = ncols;
      td.setAttribute("role", "cell");
      td.appendChild(el("h3", "sr", "Evidence"));
      if (!q.e.length) { td.appendChild(el("p", "hint", "No passage was retrieved for this question.")); }
      q.e.forEach(function (e) { td.appendChild(evidenceItem(e, q)); });
    }
    if (rows[i].nextSibling !== tr) { rows[i].parentNode.insertBefore(tr, rows[i].nextSibling); }
    tr.hidden = false;
    rows[i].classList.add("open");
  }
  function closeEvidence(details) {
    var i = rowIndex(details);
    if (i >= 0 && detailRows[i]) { detailRows[i].hidden = true; }
    if (i >= 0) { rows[i].classList.remove("open"); }
  }
  tbody.addEventListener("toggle", function (ev) {
    if (ev.target.tagName !== "DETAILS") { return; }
    if (ev.target.open) { openEvidence(ev.target); } else { closeEvidence(ev.target); }
  }, true);

  [fVerdict, fOwner, fTopic].forEach(function (s) { s.addEventListener("change", apply); });
  fText.addEventListener("input", apply);
  form.addEventListener("submit", function (ev) { ev.preventDefault(); });
  document.getElementById("show-more").addEventListener("click", function () { limit += PAGE; render(); });
  document.getElementById("show-all").addEventListener("click", function () { limit = matches.length; render(); });
  // A link to a question (from a passage to write) shows its row even when filters or paging hide it.
  function reveal(i) {
    if (matches.indexOf(i) === -1) {
      fVerdict.value = fOwner.value = fTopic.value = fText.value = "";
      apply();
    }
    var at = matches.indexOf(i);
    if (at >= limit) { limit = at + 1; render(); }
    var details = rows[i].querySelector("details");
    if (details && !details.open) { details.open = true; }
    rows[i].scrollIntoView({ block: "start" });
    rows[i].querySelector("summary").focus({ preventScroll: true });
  }
  document.addEventListener("click", function (ev) {
    var a = ev.target.closest && ev.target.closest("a[href^='#q']");
    var m = a && /^#q(\d+)$/.exec(a.getAttribute("href"));
    if (!m || +m[1] >= n) { return; }
    ev.preventDefault();
    reveal(+m[1]);
  });

  // Print what the filters select, not only the first page of it.
  window.addEventListener("beforeprint", function () {
    if (limit < matches.length) { limit = matches.length; render(); }
  });
  var note = document.getElementById("rows-note");
  if (note) { note.hidden = true; }
  form.hidden = false;
  if (n > PAGE) { render(); }
  document.documentElement.setAttribute("data-ready", "1");
})();
