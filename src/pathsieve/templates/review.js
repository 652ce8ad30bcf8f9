// pathsieve review page. Report text is only ever inserted as DOM text nodes.
(function () {
  "use strict";
  var DATA = JSON.parse(document.getElementById("ps-data").textContent);
  var STATES = DATA.states;
  var SCORE = DATA.scores;
  var POSITIVE_AT = DATA.positive_at;
  // A text marker per state, so the page reads without colour too.
  var SYMBOL = { present: "+", likely: "+?", uncertain: "?", unlikely: "\u2212?", absent: "\u2212", unmentioned: "\u00b7" };
  var SUFFIX = { historical: "hist", hypothetical: "hyp" };
  var CASES = DATA.cases;
  var LABELS = DATA.scheme.labels.map(function (l) { return l.key; });
  var DESCRIPTION = {};
  DATA.scheme.labels.forEach(function (l) { DESCRIPTION[l.key] = l.description; });
  var VALUES = DATA.scheme.values;
  var SCHEME = DATA.scheme.name;
  var STORE = "pathsieve-review:" + DATA.page_id;

  var reviews = load();
  var shown = [];      // indices into CASES that pass the filters
  var cur = -1;        // index into CASES of the case on screen
  var sel = 0;         // selected row in the label pane (labels, then values)

  function $(id) { return document.getElementById(id); }
  function el(tag, attrs) {
    var node = document.createElement(tag);
    if (attrs) {
      Object.keys(attrs).forEach(function (k) {
        if (k === "text") node.textContent = attrs[k];
        else if (k === "cls") node.className = attrs[k];
        else node.setAttribute(k, attrs[k]);
      });
    }
    for (var i = 2; i < arguments.length; i++) {
      var c = arguments[i];
      if (c === null || c === undefined) continue;
      node.appendChild(typeof c === "string" ? document.createTextNode(c) : c);
    }
    return node;
  }
  function chip(state) {
    return el("span", { cls: "chip st-" + state, text: "[" + SYMBOL[state] + "] " + state });
  }
  function positive(state) { return state in SCORE && SCORE[state] >= POSITIVE_AT; }
  function predState(c, key) { return c.labels[key] || "unmentioned"; }
  function predValue(c, key) { return c.values[key] || ""; }

  // -- storage ---------------------------------------------------------------
  function load() {
    try {
      var raw = window.localStorage.getItem(STORE);
      return raw ? JSON.parse(raw) : {};
    } catch (e) { return {}; }
  }
  function save() {
    try { window.localStorage.setItem(STORE, JSON.stringify(reviews)); } catch (e) { /* private mode */ }
  }
  function rv(c) {
    if (!reviews[c.id]) reviews[c.id] = { labels: {}, values: {} };
    return reviews[c.id];
  }
  function marks(c) {
    var r = reviews[c.id];
    if (!r) return { done: 0, wrong: 0 };
    var done = 0, wrong = 0;
    Object.keys(r.labels).forEach(function (k) { done++; if (r.labels[k].verdict === "wrong") wrong++; });
    Object.keys(r.values).forEach(function (k) { done++; if (r.values[k].verdict === "wrong") wrong++; });
    return { done: done, wrong: wrong };
  }
  function total() { return LABELS.length + VALUES.length; }

  // -- review actions ----------------------------------------------------------
  function markLabel(c, key, verdict) {
    var r = rv(c), p = predState(c, key), old = r.labels[key];
    if (verdict === "right") r.labels[key] = { verdict: "right", state: p };
    else r.labels[key] = { verdict: "wrong", state: old && old.verdict === "wrong" ? old.state : (positive(p) ? "absent" : "present") };
  }
  function setLabelState(c, key, state) {
    var r = rv(c);
    r.labels[key] = { verdict: state === predState(c, key) ? "right" : "wrong", state: state };
  }
  function markValue(c, key, verdict) {
    var r = rv(c), p = predValue(c, key), old = r.values[key];
    if (verdict === "right") r.values[key] = { verdict: "right", value: p };
    else r.values[key] = { verdict: "wrong", value: old && old.verdict === "wrong" ? old.value : "" };
  }
  function setValue(c, key, value) {
    rv(c).values[key] = { verdict: value.trim() === predValue(c, key) ? "right" : "wrong", value: value.trim() };
  }
  function clearMark(c, row) {
    var r = rv(c);
    if (row < LABELS.length) delete r.labels[LABELS[row]];
    else delete r.values[VALUES[row - LABELS.length]];
  }
  function markAllRight(c) {
    var r = rv(c);
    LABELS.forEach(function (k) { if (!r.labels[k]) markLabel(c, k, "right"); });
    VALUES.forEach(function (k) { if (!r.values[k]) markValue(c, k, "right"); });
  }
  function changed() { save(); renderPane(); renderList(); renderProgress(); }

  // -- gold CSV ------------------------------------------------------------------
  function csvField(s) {
    s = String(s);
    return /[",\r\n]/.test(s) ? '"' + s.replace(/"/g, '""') + '"' : s;
  }
  function goldCsv() {
    var lines = ["case_id,label,expected,scheme"];
    CASES.forEach(function (c) {
      var r = reviews[c.id];
      if (!r) return;
      LABELS.forEach(function (k) {
        if (r.labels[k]) lines.push([c.id, k, r.labels[k].state, SCHEME].map(csvField).join(","));
      });
      VALUES.forEach(function (k) {
        if (r.values[k]) lines.push([c.id, k, r.values[k].value, SCHEME].map(csvField).join(","));
      });
    });
    return lines.join("\r\n") + "\r\n";
  }
  function download() {
    var blob = new Blob([goldCsv()], { type: "text/csv;charset=utf-8" });
    var a = el("a", { href: URL.createObjectURL(blob), download: "gold-" + (SCHEME || "review") + ".csv" });
    document.body.appendChild(a);
    a.click();
    setTimeout(function () { URL.revokeObjectURL(a.href); a.remove(); }, 1000);
  }

  // -- filters and case list -------------------------------------------------------
  function passes(c) {
    var lab = $("f-label").value, st = $("f-state").value, rvw = $("f-review").value;
    if (lab !== "*") {
      var s = predState(c, lab);
      if (st === "*" ? s === "unmentioned" : s !== st) return false;
    } else if (st !== "*") {
      if (!LABELS.some(function (k) { return predState(c, k) === st; })) return false;
    }
    var m = marks(c);
    if (rvw === "todo" && m.done > 0) return false;
    if (rvw === "done" && m.done === 0) return false;
    if (rvw === "wrong" && m.wrong === 0) return false;
    return true;
  }
  function applyFilters() {
    shown = [];
    CASES.forEach(function (c, i) { if (passes(c)) shown.push(i); });
    $("f-count").textContent = shown.length + " of " + CASES.length + " cases match";
    if (shown.indexOf(cur) < 0) cur = shown.length ? shown[0] : -1;
    renderList();
    renderCase();
  }
  function summary(c) {
    var bits = [];
    LABELS.forEach(function (k) {
      var s = predState(c, k);
      if (s !== "unmentioned") bits.push(k + " [" + SYMBOL[s] + "]");
    });
    return bits.join(", ") || "no label mentioned";
  }
  function renderList() {
    var list = $("case-list");
    list.textContent = "";
    shown.forEach(function (i) {
      var c = CASES[i], m = marks(c);
      var li = el("li", { cls: i === cur ? "current" : "", "data-case": c.id },
        el("span", { cls: "prog" + (m.done === total() ? " full" : ""), text: m.done + "/" + total() }),
        el("span", { cls: "cid", text: c.id }),
        c.status === "error" ? el("span", { cls: "status-error", text: " error" }) : null,
        el("span", { cls: "sum", text: summary(c) }));
      li.addEventListener("click", function () { go(i); });
      list.appendChild(li);
    });
    var current = list.querySelector("li.current");
    if (current && current.scrollIntoView) current.scrollIntoView({ block: "nearest" });
  }
  function go(i) {
    cur = i;
    sel = 0;
    if (cur >= 0) { try { history.replaceState(null, "", "#" + encodeURIComponent(CASES[cur].id)); } catch (e) { /* file: */ } }
    renderList();
    renderCase();
  }
  function step(d) {
    var at = shown.indexOf(cur);
    var next = at + d;
    if (next >= 0 && next < shown.length) go(shown[next]);
  }

  // -- the report ----------------------------------------------------------------
  function spanTitle(s) {
    var bits = [];
    bits.push(s.kind === "value" ? s.value_key + " = " + s.value : (s.concept || "mention"));
    if (s.kind !== "value") bits.push(s.certainty);
    if (s.temporality !== "current") bits.push(s.temporality);
    if (s.experiencer !== "patient") bits.push("about someone else (" + s.experiencer + ")");
    bits.push("section " + (s.section || "?") + (s.part ? ", part " + s.part : ""));
    if (s.labels && s.labels.length) bits.push("labels: " + s.labels.join(", "));
    s.triggers.forEach(function (t) { bits.push("trigger \u201c" + t[3] + "\u201d (" + t[2] + ")"); });
    bits.push(s.decides ? "decides the label" : "does not decide a label");
    if (s.flags && s.flags.length) bits.push("flags: " + s.flags.join(", "));
    if (s.note) bits.push(s.note);
    return bits.join("; ");
  }
  function isContext(s) { return s.kind !== "value" && !(s.labels && s.labels.length); }
  function marker(s) {
    if (s.kind === "value") return el("sup", { cls: "mk val", text: "[" + s.value_key + "]" });
    var extra = [];
    if (SUFFIX[s.temporality]) extra.push(SUFFIX[s.temporality]);
    if (s.experiencer !== "patient") extra.push("other");
    if (!s.decides && !extra.length) extra.push("n/d");
    var state = s.certainty in SYMBOL ? s.certainty : "present";
    return el("sup", { cls: "mk st-" + state, text: "[" + SYMBOL[state] + (extra.length ? " " + extra.join(" ") : "") + "]" });
  }
  function renderReport(c) {
    var box = $("report");
    box.textContent = "";
    var text = c.text, n = text.length;
    var spans = c.spans.filter(function (s) { return !s.bad && s.e > s.s; });
    var cuts = {};
    function cut(x) { if (x >= 0 && x <= n) cuts[x] = true; }
    cut(0); cut(n);
    spans.forEach(function (s) { cut(s.s); cut(s.e); s.triggers.forEach(function (t) { cut(t[0]); cut(t[1]); }); });
    c.sections.forEach(function (s) { cut(s[0]); cut(s[4]); });
    c.parts.forEach(function (p) { cut(p[0]); cut(p[1]); });
    var pts = Object.keys(cuts).map(Number).sort(function (a, b) { return a - b; });
    var partIndex = {};
    c.parts.forEach(function (p, i) { partIndex[p[0] + ":" + p[2]] = i; });
    for (var i = 0; i < pts.length; i++) {
      var a = pts[i];
      c.sections.forEach(function (s) {
        if (s[0] === a && s[1] > s[0]) box.appendChild(el("span", { cls: "sec-tag", text: "\u00a7 " + s[2].replace(/_/g, " ") }));
      });
      c.parts.forEach(function (p) {
        if (p[0] === a) box.appendChild(el("span", { cls: "part-tag", title: p[3] || "", text: "part " + p[2] }));
      });
      if (i === pts.length - 1) break;
      var b = pts[i + 1];
      var seg = text.slice(a, b);
      var sec = null, part = null;
      c.sections.forEach(function (s) { if (s[0] <= a && a < s[1]) sec = s; });
      c.parts.forEach(function (p, j) { if (p[0] <= a && a < p[1]) part = j; });
      var cover = spans.filter(function (s) { return s.s <= a && b <= s.e; });
      var trig = spans.some(function (s) { return s.triggers.some(function (t) { return t[0] <= a && b <= t[1]; }); });
      var cls = [];
      if (sec) { cls.push("sec-" + sec[2]); if (a < sec[4]) cls.push("hdr"); }
      if (part !== null && part % 2 === 1) cls.push("part-odd");
      if (trig) cls.push("trig");
      var node;
      // mentions that bear on no label (sites, procedures) are context: no colour, no marker
      var bearing = cover.filter(function (s) { return !isContext(s); });
      if (cover.length && !bearing.length) {
        cls.push("ctx");
        node = el("span", { cls: cls.join(" "), title: cover.map(spanTitle).join("\n") }, seg);
      } else if (cover.length) {
        var inner = bearing.reduce(function (x, y) { return (y.e - y.s) < (x.e - x.s) ? y : x; });
        cls.push("m");
        if (inner.kind === "value") cls.push("val");
        else cls.push("st-" + (inner.certainty in SYMBOL ? inner.certainty : "present"));
        if (!inner.decides) cls.push("nd");
        node = el("mark", { cls: cls.join(" "), title: cover.map(spanTitle).join("\n"), "data-labels": (inner.labels || []).join(" ") }, seg);
        node.addEventListener("click", (function (keys) {
          return function () { selectByKey(keys); };
        })(inner.labels || []));
      } else {
        node = el("span", { cls: cls.join(" ") }, seg);
      }
      box.appendChild(node);
      cover.forEach(function (s) { if (s.e === b && !isContext(s)) box.appendChild(marker(s)); });
    }
  }
  function renderLegend() {
    var box = $("legend");
    box.textContent = "";
    box.appendChild(el("span", { text: "Certainty: " }));
    STATES.forEach(function (s) { if (s !== "unmentioned") box.appendChild(chip(s)); });
    box.appendChild(el("br"));
    box.appendChild(document.createTextNode(
      "Markers after a mention: [+] present, [+?] likely, [?] uncertain, [\u2212?] unlikely, [\u2212] absent; " +
      "\u201chist\u201d historical, \u201chyp\u201d hypothetical or a request, \u201cother\u201d about someone else, " +
      "\u201cn/d\u201d did not decide (e.g. clinical history). Dashed underline: does not decide a label. " +
      "Boxed brown text: a value. Wavy underline: the assertion trigger. Dotted grey underline: a term that bears on no label (site, procedure). " +
      "Hover a mention for details; click it to select its label."));
  }
  function renderCase() {
    var head = $("case-head"), warn = $("warn");
    head.textContent = ""; warn.textContent = "";
    if (cur < 0) {
      $("report").textContent = "";
      head.appendChild(el("p", { cls: "empty", text: "No case matches the filters." }));
      renderPane();
      return;
    }
    var c = CASES[cur];
    var meta = el("div", { cls: "meta" });
    meta.appendChild(el("span", { text: "case " + (shown.indexOf(cur) + 1) + " of " + shown.length }));
    if (c.primary) meta.appendChild(el("span", { text: "primary label: " + c.primary }));
    if (c.stratum) meta.appendChild(el("span", { text: "sampled for: " + c.stratum }));
    if (c.parts.length) meta.appendChild(el("span", { text: "parts: " + c.parts.map(function (p) { return p[2]; }).filter(function (v, i, a) { return a.indexOf(v) === i; }).join(", ") }));
    if (c.flags.length) meta.appendChild(el("span", { text: "flags: " + c.flags.join(", ") }));
    head.appendChild(el("h1", { text: c.id }));
    head.appendChild(meta);
    if (c.status === "error") warn.appendChild(el("div", { cls: "status-error", text: "Labelling failed for this case: " + (c.error || "no message") }));
    var bad = c.spans.filter(function (s) { return s.bad; });
    if (bad.length) warn.appendChild(el("div", { text: bad.length + " evidence row(s) point outside the text or at different text and are not shown: " + bad.map(function (s) { return "\u201c" + s.text + "\u201d"; }).join(", ") }));
    renderReport(c);
    renderPane();
  }

  // -- the label pane ------------------------------------------------------------
  function stateSelect(c, key, current) {
    var s = el("select", { cls: "set", "aria-label": "correct state of " + key });
    s.appendChild(el("option", { value: "", text: "set state\u2026" }));
    STATES.forEach(function (st) { s.appendChild(el("option", { value: st, text: "[" + SYMBOL[st] + "] " + st })); });
    s.value = current || "";
    s.addEventListener("change", function () {
      if (s.value) setLabelState(c, key, s.value); else delete rv(c).labels[key];
      changed();
    });
    return s;
  }
  function verdictButtons(onRight, onWrong, verdict, name) {
    var ok = el("button", { type: "button", cls: "v ok", title: name + " is right (y)", "aria-pressed": String(verdict === "right"), text: "\u2713" });
    var no = el("button", { type: "button", cls: "v no", title: name + " is wrong (x)", "aria-pressed": String(verdict === "wrong"), text: "\u2717" });
    ok.addEventListener("click", onRight);
    no.addEventListener("click", onWrong);
    return [ok, no];
  }
  function renderPane() {
    var lt = $("label-table"), vt = $("value-table");
    lt.textContent = ""; vt.textContent = "";
    if (cur < 0) return;
    var c = CASES[cur], r = reviews[c.id] || { labels: {}, values: {} };
    LABELS.forEach(function (key, row) {
      var p = predState(c, key), mark = r.labels[key];
      var tr = el("tr", { "data-key": key, cls: (row === sel ? "sel " : "") + (mark ? "rv-" + mark.verdict : "") });
      var perPart = Object.keys(c.part_labels || {});
      var partsLine = perPart.length > 1 ? el("div", { cls: "parts", text: perPart.map(function (pt) { return pt + ": [" + SYMBOL[c.part_labels[pt][key] || "unmentioned"] + "]"; }).join("  ") }) : null;
      var btns = verdictButtons(
        function () { sel = row; markLabel(c, key, "right"); changed(); },
        function () { sel = row; markLabel(c, key, "wrong"); changed(); },
        mark && mark.verdict, key);
      tr.appendChild(el("td", { cls: "lk", title: DESCRIPTION[key] || "" }, el("div", { text: key }), chip(p), partsLine));
      tr.appendChild(el("td", { cls: "rv" }, btns[0], " ", btns[1], el("br"), stateSelect(c, key, mark ? mark.state : "")));
      tr.appendChild(el("td", { cls: "out", text: mark ? (mark.verdict === "right" ? "right" : "\u2192 " + mark.state) : "" }));
      tr.addEventListener("click", function () { if (sel !== row) { sel = row; highlightSel(); } });
      lt.appendChild(tr);
    });
    $("values-title").style.display = VALUES.length ? "" : "none";
    VALUES.forEach(function (key, j) {
      var row = LABELS.length + j, p = predValue(c, key), mark = r.values[key];
      var tr = el("tr", { "data-key": key, cls: (row === sel ? "sel " : "") + (mark ? "rv-" + mark.verdict : "") });
      var btns = verdictButtons(
        function () { sel = row; markValue(c, key, "right"); changed(); },
        function () { sel = row; markValue(c, key, "wrong"); changed(); },
        mark && mark.verdict, key);
      var cell = el("td", { cls: "rv" }, btns[0], " ", btns[1]);
      if (mark && mark.verdict === "wrong") {
        var input = el("input", { cls: "fix", type: "text", placeholder: "correct value (empty: not stated)", "aria-label": "correct " + key });
        input.value = mark.value;
        input.addEventListener("change", function () { setValue(c, key, input.value); changed(); });
        cell.appendChild(el("br"));
        cell.appendChild(input);
      }
      tr.appendChild(el("td", { cls: "lk" }, el("div", { text: key }),
        p ? el("span", { cls: "chip pv", text: p }) : el("span", { cls: "empty", text: "not stated" })));
      tr.appendChild(cell);
      tr.appendChild(el("td", { cls: "out", text: mark ? (mark.verdict === "right" ? "right" : "\u2192 " + (mark.value || "(not stated)")) : "" }));
      tr.addEventListener("click", function () { if (sel !== row) { sel = row; highlightSel(); } });
      vt.appendChild(tr);
    });
  }
  function highlightSel() {
    var rows = document.querySelectorAll("#label-table tr, #value-table tr");
    rows.forEach(function (tr, i) { tr.classList.toggle("sel", i === sel); });
    if (rows[sel] && rows[sel].scrollIntoView) rows[sel].scrollIntoView({ block: "nearest" });
  }
  function selectByKey(keys) {
    for (var i = 0; i < keys.length; i++) {
      var at = LABELS.indexOf(keys[i]);
      if (at < 0) at = VALUES.indexOf(keys[i]) >= 0 ? LABELS.length + VALUES.indexOf(keys[i]) : -1;
      if (at >= 0) { sel = at; highlightSel(); return; }
    }
  }
  function renderProgress() {
    var cases = 0, done = 0;
    CASES.forEach(function (c) { var m = marks(c); if (m.done) { cases++; done += m.done; } });
    $("progress").textContent = done + " mark(s) in " + cases + " of " + CASES.length + " case(s)";
    $("n-cases").textContent = CASES.length + " case(s)";
  }

  // -- keyboard --------------------------------------------------------------------
  document.addEventListener("keydown", function (ev) {
    var t = ev.target;
    var typing = t && (t.tagName === "INPUT" || t.tagName === "SELECT" || t.tagName === "TEXTAREA");
    if (typing) { if (ev.key === "Escape") t.blur(); return; }
    if (ev.ctrlKey || ev.metaKey || ev.altKey) return;
    var c = cur >= 0 ? CASES[cur] : null;
    var rows = total();
    var handled = true;
    switch (ev.key) {
      case "j": case "ArrowRight": step(1); break;
      case "k": case "ArrowLeft": step(-1); break;
      case "ArrowDown": sel = Math.min(rows - 1, sel + 1); highlightSel(); break;
      case "ArrowUp": sel = Math.max(0, sel - 1); highlightSel(); break;
      case "y": case "x":
        if (!c) break;
        var verdict = ev.key === "y" ? "right" : "wrong";
        if (sel < LABELS.length) markLabel(c, LABELS[sel], verdict);
        else markValue(c, VALUES[sel - LABELS.length], verdict);
        changed();
        break;
      case "1": case "2": case "3": case "4": case "5": case "6":
        if (!c || sel >= LABELS.length) break;
        setLabelState(c, LABELS[sel], STATES[Number(ev.key) - 1]);
        changed();
        break;
      case "u": if (c) { clearMark(c, sel); changed(); } break;
      case "A": if (c) { markAllRight(c); changed(); } break;
      case "d": download(); break;
      default: handled = false;
    }
    if (handled) ev.preventDefault();
  });

  // -- start ---------------------------------------------------------------------
  function fillFilters() {
    var fl = $("f-label"), fs = $("f-state");
    fl.appendChild(el("option", { value: "*", text: "any label" }));
    LABELS.forEach(function (k) { fl.appendChild(el("option", { value: k, text: k })); });
    fs.appendChild(el("option", { value: "*", text: "any state" }));
    STATES.forEach(function (s) { fs.appendChild(el("option", { value: s, text: "[" + SYMBOL[s] + "] " + s })); });
    [fl, fs, $("f-review")].forEach(function (s) { s.addEventListener("change", applyFilters); });
  }
  $("download").addEventListener("click", download);
  $("all-right").addEventListener("click", function () { if (cur >= 0) { markAllRight(CASES[cur]); changed(); } });
  $("clear-case").addEventListener("click", function () { if (cur >= 0) { delete reviews[CASES[cur].id]; changed(); } });
  fillFilters();
  renderLegend();
  var missing = DATA.missing.reports.length + DATA.missing.labels.length;
  if (missing) {
    var note = el("p", { cls: "notice caution", text: missing + " listed case(s) could not be shown (no report text or no label row): " +
      DATA.missing.reports.concat(DATA.missing.labels).join(", ") });
    $("top").appendChild(note);
  }
  function fromHash() {
    var want = decodeURIComponent((location.hash || "").slice(1));
    for (var i = 0; i < CASES.length; i++) if (CASES[i].id === want) return i;
    return -1;
  }
  // a link to "review.html#CASE" opens that case
  window.addEventListener("hashchange", function () {
    var i = fromHash();
    if (i >= 0 && i !== cur) {
      if (shown.indexOf(i) < 0) {
        $("f-label").value = "*"; $("f-state").value = "*"; $("f-review").value = "all";
        cur = i;
        applyFilters();
      } else go(i);
    }
  });
  cur = fromHash();
  if (cur < 0 && CASES.length) cur = 0;
  applyFilters();
  renderProgress();
  document.body.setAttribute("data-ready", "1");
})();
