// ramify report: builds the tree from the embedded data, a level at a
// time, when a category is opened.
//
// Data layout (see report/write.go):
//   cats[i]  = [name, provisional 0|1, parent, size, support (-1: none),
//               [child cats], [items], [records], [marks], was]
//   items[i] = [id, label, text, [tags], cat, [records]?, mark?, from?]
//   recs[i]  = [kind, file:line, by, date, note, summary]
//   moved[k] = [item, id, from]
// cats[0] is the root (the file itself); it has no row. The items are a
// document of their own after this script: the top level is built while
// the browser still reads them, and they are parsed when first needed.
"use strict";
(function () {
  const D = JSON.parse(document.getElementById("meta").textContent);
  const cats = D.cats;
  let items = null;
  function loadItems() {
    if (!items) items = JSON.parse(document.getElementById("items").textContent);
    return items;
  }
  // afterLoad wraps a handler that needs the items: until the page has
  // been read to its end, the call waits for it.
  function afterLoad(fn) {
    return function (...args) {
      if (document.readyState === "loading") document.addEventListener("DOMContentLoaded", () => fn.apply(this, args), { once: true });
      else fn.apply(this, args);
    };
  }
  const CHUNK = 200; // item rows built per "show more"
  const tree = document.getElementById("tree");
  const catNode = new Map();  // cat index -> li
  const itemNode = new Map(); // item index -> li
  const shown = new Map();    // cat index -> item rows built so far

  function el(tag, cls, text) {
    const e = document.createElement(tag);
    if (cls) e.className = cls;
    if (text !== undefined) e.textContent = text;
    return e;
  }
  function plural(n, one, many) { return n.toLocaleString("en") + " " + (n === 1 ? one : many); }
  function catName(ci) { const c = cats[ci]; return (c[1] ? "~ " : "") + c[0]; }
  function catPath(ci) {
    const parts = [];
    for (let c = ci; c > 0; c = cats[c][2]) parts.push(catName(c));
    return parts.reverse().join(" / ") || "(top level)";
  }
  function mark(text, kind, title) {
    const m = el("span", "mark m-" + kind, text);
    if (title) m.title = title;
    return m;
  }
  function supportView(s) {
    const w = el("span", "support");
    const meter = el("span", "meter");
    meter.setAttribute("aria-hidden", "true");
    const fill = el("span");
    fill.style.width = Math.round(s * 100) + "%";
    meter.appendChild(fill);
    w.appendChild(meter);
    w.appendChild(document.createTextNode("support " + Math.round(s * 100) + "%"));
    return w;
  }
  const markWords = { created: "new", renamed: "renamed", split: "split", merged: "merged" };

  // ---- rows ----
  // A closed tree entry and its row, for catRow and itemRow;
  // kind ("cat", "item") is its class and data key.
  function treeRow(kind, i, twist) {
    const li = el("li", kind);
    li.setAttribute("role", "treeitem");
    li.setAttribute("aria-expanded", "false");
    li.tabIndex = -1;
    li.dataset[kind] = i;
    const row = el("div", "row");
    row.appendChild(el("span", "twist", twist));
    li.appendChild(row);
    return [li, row];
  }
  function catRow(ci) {
    const c = cats[ci];
    const [li, row] = treeRow("cat", ci, "\u25b8");
    row.appendChild(el("span", "name", c[0]));
    if (c[1]) row.appendChild(mark("draft name", "draft", "provisional: made up from the members' tags and words"));
    row.appendChild(el("span", "count", plural(c[3], "item", "items")));
    if (c[4] >= 0) row.appendChild(supportView(c[4]));
    for (const m of c[8]) row.appendChild(mark(markWords[m] || m, m, c[9] || undefined));
    if (c[7].length) row.appendChild(mark(plural(c[7].length, "decision", "decisions"), "rec"));
    li.setAttribute("aria-label", catName(ci) + ", " + plural(c[3], "item", "items"));
    catNode.set(ci, li);
    return li;
  }
  function itemRow(ii) {
    const it = items[ii];
    const [li, row] = treeRow("item", ii, "\u2022");
    row.appendChild(el("span", "id", it[0]));
    if (it[1]) row.appendChild(el("span", "label", it[1]));
    if (it[6] === "moved") row.appendChild(mark("moved", "moved", "from " + it[7]));
    if (it[6] === "moved") row.appendChild(el("span", "from muted small", "from " + it[7]));
    if (it[6] === "added") row.appendChild(mark("new", "added"));
    const recs = it[5] || [];
    if (recs.length) row.appendChild(mark(plural(recs.length, "decision", "decisions"), "rec"));
    itemNode.set(ii, li);
    return li;
  }
  function recordList(list) {
    const ul = el("ul", "recs");
    for (const r of list) {
      const x = D.recs[r];
      const li = el("li");
      li.appendChild(el("strong", "", x[0]));
      li.appendChild(document.createTextNode(" " + x[5] + " \u2014 "));
      li.appendChild(el("code", "", x[1]));
      const who = [x[2] && "by " + x[2], x[3]].filter(Boolean).join(", ");
      if (who) li.appendChild(document.createTextNode(" (" + who + ")"));
      if (x[4]) { li.appendChild(document.createTextNode(": ")); li.appendChild(el("em", "", x[4])); }
      ul.appendChild(li);
    }
    return ul;
  }

  // ---- opening and closing ----
  function openCat(li, open) {
    const ci = +li.dataset.cat;
    li.setAttribute("aria-expanded", open ? "true" : "false");
    li.querySelector(".twist").textContent = open ? "\u25be" : "\u25b8";
    let box = li.querySelector(":scope > ul");
    if (open && !box) {
      loadItems();
      const c = cats[ci];
      if (c[7].length) {
        const d = el("div", "detail");
        d.appendChild(el("p", "", "What holds this category:"));
        d.appendChild(recordList(c[7]));
        if (c[9]) d.appendChild(el("p", "muted", "Since the base: " + c[9] + "."));
        li.appendChild(d);
      } else if (c[9]) {
        li.appendChild(el("p", "detail muted", "Since the base: " + c[9] + "."));
      }
      box = el("ul");
      box.setAttribute("role", "group");
      for (const k of c[5]) box.appendChild(catRow(k));
      li.appendChild(box);
      shown.set(ci, 0);
      moreItems(ci, CHUNK);
    }
    if (box) box.hidden = !open;
    const d = li.querySelector(":scope > .detail");
    if (d) d.hidden = !open;
  }
  function moreItems(ci, n) {
    const li = catNode.get(ci);
    const box = li.querySelector(":scope > ul");
    const list = cats[ci][6];
    const old = box.querySelector(":scope > li.more-row");
    if (old) old.remove();
    const from = shown.get(ci), to = Math.min(list.length, from + n);
    const frag = document.createDocumentFragment();
    for (let k = from; k < to; k++) frag.appendChild(itemRow(list[k]));
    box.appendChild(frag);
    shown.set(ci, to);
    if (to < list.length) {
      const mli = el("li", "more-row");
      const b = el("button", "more", "show " + Math.min(CHUNK, list.length - to) + " more of " + plural(list.length - to, "item", "items"));
      b.type = "button";
      b.addEventListener("click", (ev) => { ev.stopPropagation(); moreItems(ci, CHUNK); });
      mli.appendChild(b);
      box.appendChild(mli);
    }
  }
  function openItem(li, open) {
    li.setAttribute("aria-expanded", open ? "true" : "false");
    let d = li.querySelector(":scope > .detail");
    if (open && !d) {
      const it = items[+li.dataset.item];
      d = el("div", "detail");
      if (it[1]) d.appendChild(el("p", "", it[1]));
      if (it[3].length) {
        const ul = el("ul", "tags");
        ul.setAttribute("aria-label", "tags");
        for (const t of it[3]) ul.appendChild(el("li", "", D.tags[t]));
        d.appendChild(ul);
      }
      if (it[2]) d.appendChild(el("p", "muted", it[2]));
      if (it[6] === "moved") d.appendChild(el("p", "", "Moved since the base, from " + it[7] + "."));
      const recs = it[5] || [];
      if (recs.length) { d.appendChild(el("p", "", "Decisions that name it:")); d.appendChild(recordList(recs)); }
      else d.appendChild(el("p", "muted", "No decision names this item; the similarities alone place it."));
      li.appendChild(d);
    }
    if (d) d.hidden = !open;
  }
  function toggle(li) {
    const open = li.getAttribute("aria-expanded") !== "true";
    if (li.dataset.cat !== undefined) openCat(li, open); else openItem(li, open);
  }

  // ---- focus and keys (a roving tab stop over the visible rows) ----
  let current = null;
  function focusRow(li) {
    if (!li) return;
    if (current) current.tabIndex = -1;
    current = li;
    li.tabIndex = 0;
    li.focus();
  }
  function visibleRows() {
    return Array.from(tree.querySelectorAll("[role=treeitem]")).filter((li) => li.offsetParent !== null);
  }
  tree.addEventListener("click", afterLoad((ev) => {
    if (ev.target.closest("button, a")) return;
    const li = ev.target.closest("[role=treeitem]");
    if (!li) return;
    toggle(li);
    focusRow(li);
  }));
  tree.addEventListener("keydown", (ev) => {
    const li = ev.target.closest("[role=treeitem]");
    if (!li) return;
    if (document.readyState === "loading") {
      if (ev.key.startsWith("Arrow") || ev.key === "Enter" || ev.key === " ") ev.preventDefault();
      return;
    }
    const open = li.getAttribute("aria-expanded") === "true";
    const rows = () => visibleRows();
    switch (ev.key) {
      case "ArrowDown": { const r = rows(); focusRow(r[r.indexOf(li) + 1]); break; }
      case "ArrowUp": { const r = rows(); focusRow(r[r.indexOf(li) - 1]); break; }
      case "Home": focusRow(rows()[0]); break;
      case "End": { const r = rows(); focusRow(r[r.length - 1]); break; }
      case "ArrowRight":
        if (!open) toggle(li);
        else if (li.dataset.cat !== undefined) focusRow(li.querySelector(":scope > ul > [role=treeitem]"));
        break;
      case "ArrowLeft":
        if (open) toggle(li);
        else focusRow(li.parentElement.closest("[role=treeitem]"));
        break;
      case "Enter": case " ": toggle(li); break;
      default: return;
    }
    ev.preventDefault();
  });

  // reveal opens the path to a category or item and focuses its row.
  function reveal(kind, idx) {
    loadItems();
    const chain = [];
    let ci = kind === "cat" ? cats[idx][2] : items[idx][4];
    for (; ci > 0; ci = cats[ci][2]) chain.push(ci);
    chain.reverse();
    for (const c of chain) {
      const li = catNode.get(c);
      if (li.getAttribute("aria-expanded") !== "true") openCat(li, true);
    }
    let target;
    if (kind === "cat") target = catNode.get(idx);
    else {
      const c = items[idx][4];
      if (!itemNode.has(idx)) {
        const pos = cats[c][6].indexOf(idx);
        moreItems(c, pos + 1 - shown.get(c));
      }
      target = itemNode.get(idx);
    }
    if (!target) return;
    focusRow(target);
    target.scrollIntoView({ block: "center" });
    const row = target.querySelector(".row");
    row.classList.add("flash");
    setTimeout(() => row.classList.remove("flash"), 1500);
  }
  function revealButton(kind, idx, text) {
    const b = el("button", "link", text);
    b.type = "button";
    b.addEventListener("click", afterLoad(() => reveal(kind, idx)));
    return b;
  }

  // ---- search ----
  const input = document.getElementById("search");
  const results = document.getElementById("results");
  let hay = null; // lower-cased text per item, built at the first search
  function search(q) {
    results.textContent = "";
    q = q.trim().toLowerCase();
    if (q.length < 2) return;
    loadItems();
    if (!hay) hay = items.map((it) => (it[0] + "\u0001" + it[1]).toLowerCase());
    const found = [];
    const LIMIT = 40;
    for (let c = 1; c < cats.length && found.length < LIMIT; c++)
      if (cats[c][0].toLowerCase().includes(q)) found.push(["cat", c]);
    for (let i = 0; i < items.length && found.length < LIMIT; i++)
      if (hay[i].includes(q)) found.push(["item", i]);
    for (const [kind, idx] of found) {
      const li = el("li");
      const text = kind === "cat" ? catName(idx) + "/  (" + plural(cats[idx][3], "item", "items") + ")"
        : items[idx][0] + (items[idx][1] ? " \u2014 " + items[idx][1] : "");
      li.appendChild(revealButton(kind, idx, text));
      li.appendChild(el("span", "path muted small", kind === "cat" ? catPath(cats[idx][2]) : catPath(items[idx][4])));
      results.appendChild(li);
    }
    if (!found.length) results.appendChild(el("li", "muted", "nothing matches \u201c" + q + "\u201d"));
  }
  let timer = 0;
  input.addEventListener("input", () => { clearTimeout(timer); timer = setTimeout(afterLoad(() => search(input.value)), 120); });
  input.addEventListener("keydown", (ev) => {
    if (ev.key === "Enter" && document.readyState !== "loading") { search(input.value); const b = results.querySelector("button"); if (b) b.click(); ev.preventDefault(); }
    if (ev.key === "Escape") { input.value = ""; results.textContent = ""; }
  });
  document.addEventListener("keydown", (ev) => {
    if (ev.key === "/" && document.activeElement !== input) { input.focus(); ev.preventDefault(); }
  });

  // ---- side panel ----
  function sideBody(id) { return document.querySelector("#" + id + " .body"); }
  function fillWeak() {
    const b = sideBody("weak");
    if (!D.support.computed) {
      b.appendChild(el("p", "note muted", "Support was not computed. Run ramify report --support to measure how firmly the committee's trees hold each category."));
      return;
    }
    b.appendChild(el("p", "note muted", "Share of " + D.support.trees + " committee trees that hold each category; lowest first."));
    const ol = el("ol");
    for (const ci of D.weakest) {
      const li = el("li");
      li.appendChild(revealButton("cat", ci, catName(ci)));
      li.appendChild(document.createTextNode(" " + Math.round(cats[ci][4] * 100) + "%"));
      ol.appendChild(li);
    }
    b.appendChild(ol);
  }
  function fillChanges() {
    const b = sideBody("changes");
    const ch = D.changes;
    if (!ch) { b.appendChild(el("p", "note muted", D.note || "No base version to compare with.")); return; }
    b.appendChild(el("p", "note", "Since " + D.base + ":"));
    const ul = el("ul");
    const facts = [[ch.moved, "item moved", "items moved"], [ch.added, "item added", "items added"],
      [ch.removed, "item removed", "items removed"], [ch.created, "category created", "categories created"],
      [ch.dissolved, "category dissolved", "categories dissolved"], [ch.renamed, "category renamed", "categories renamed"],
      [ch.split, "category split", "categories split"], [ch.merged, "merge", "merges"]];
    for (const [n, one, many] of facts) if (n) ul.appendChild(el("li", "", plural(n, one, many)));
    if (!ul.children.length) ul.appendChild(el("li", "", "nothing changed"));
    b.appendChild(ul);
    const moved = D.moved;
    if (moved.length) {
      b.appendChild(el("h3", "small", "Moved items"));
      const ol = el("ol", "moved-list");
      for (const [i, id, from] of moved.slice(0, 200)) {
        const li = el("li");
        li.dataset.item = id;
        li.appendChild(revealButton("item", i, id));
        li.appendChild(el("span", "muted small", " from " + from));
        ol.appendChild(li);
      }
      b.appendChild(ol);
      if (moved.length > 200) b.appendChild(el("p", "muted small", "and " + plural(moved.length - 200, "more", "more") + "; search for them by id"));
    }
    if (ch.removed_items.length) {
      b.appendChild(el("h3", "small", "Removed items"));
      const ol = el("ol");
      for (const r of ch.removed_items.slice(0, 200)) ol.appendChild(el("li", "", r.id + " (was in " + r.path + ")"));
      b.appendChild(ol);
    }
    if (ch.dissolved_categories.length) {
      b.appendChild(el("h3", "small", "Dissolved categories"));
      const ol = el("ol");
      for (const p of ch.dissolved_categories.slice(0, 200)) ol.appendChild(el("li", "", p));
      b.appendChild(ol);
    }
  }
  function fillReview() {
    const b = sideBody("review");
    const r = D.review;
    const a = r.audits;
    if (a) {
      const pct = (x) => (x * 100).toFixed(1) + "%";
      b.appendChild(el("p", "note", "Audits on this version: " + a.answered + " answered, " + a.rejected + " rejected."));
      if (a.answered) b.appendChild(el("p", "note", "Reject rate " + pct(a.rate) + "; 95% interval " + pct(a.interval[0]) + " to " + pct(a.interval[1]) + " (exact, Clopper-Pearson)."));
      const gate = "Release gate: at least " + r.min_audits + " audits and the interval's upper end at most " + pct(r.max_reject_rate) + ": ";
      b.appendChild(el("p", "note " + (r.gate_passed ? "gate-ok" : "gate-no"), gate + (r.gate_passed ? "met." : "not met yet.")));
      if (a.older) b.appendChild(el("p", "note muted", plural(a.older, "audit", "audits") + " of earlier versions not counted."));
    }
    b.appendChild(el("h3", "small", plural(r.open.length, "open packet", "open packets")));
    let byID = null;
    const revealID = (id) => {
      if (!byID) byID = new Map(loadItems().map((it, i) => [it[0], i]));
      if (byID.has(id)) reveal("item", byID.get(id));
    };
    const ol = el("ol");
    for (const o of r.open) {
      const li = el("li");
      li.appendChild(el("code", "", o.file));
      li.appendChild(document.createTextNode(" " + o.reason + ", " + o.verdict + ", drawn " + o.drawn + (o.current ? "" : " (from an earlier version)") + ": "));
      o.items.forEach((id, k) => {
        if (k) li.appendChild(document.createTextNode(", "));
        const bt = el("button", "link", id);
        bt.type = "button";
        bt.addEventListener("click", afterLoad(() => revealID(id)));
        li.appendChild(bt);
      });
      ol.appendChild(li);
    }
    b.appendChild(ol);
  }

  // ---- the top level ----
  const root = cats[0];
  document.getElementById("summary").textContent = plural(root[3], "item", "items") + " in " +
    plural(cats.length - 1, "category", "categories") + " \u00b7 structure " + D.structure +
    (D.base ? " \u00b7 changes since " + D.base : "");
  const frag = document.createDocumentFragment();
  for (const k of root[5]) frag.appendChild(catRow(k));
  tree.appendChild(frag);
  catNode.set(0, tree);
  if (root[6].length) {
    // Items at the top level sit under the categories.
    afterLoad(() => {
      loadItems();
      shown.set(0, 0);
      catNode.set(0, { querySelector: () => tree });
      moreItems(0, CHUNK);
    })();
  }
  const first = tree.querySelector("[role=treeitem]");
  if (first) { first.tabIndex = 0; current = first; }
  fillWeak();
  fillChanges();
  fillReview();
  window.ramifyReport = { reveal: reveal, ready: true, readyAt: performance.now() };
  document.body.dataset.ready = "true";
  // Parse the items as soon as the page is read, while the reader looks at
  // the top level.
  afterLoad(() => {
    loadItems();
    window.ramifyReport.itemsAt = performance.now();
    document.body.dataset.items = "true";
  })();
})();
