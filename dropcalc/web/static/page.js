// dropcalc page: the form, the plan drawing and the answer. Our own code, no library, no
// network beyond this page's own server. Part of dropcalc, under the project's licence.
//
// The form lives in `form` (the same shape the server's dropcalc/web/form.py checks); every
// input writes into it and asks for a recompute. Answers carry the request id they were asked
// with: one that is not the latest is dropped, and while a newer one is on its way the shown
// answer is marked out of date. User text only ever reaches the page through textContent or
// input values, never as markup.
"use strict";

const boot = JSON.parse(document.getElementById("boot").textContent);
const SVG = "http://www.w3.org/2000/svg";
// Work areas take the colours a0..a5 of the style sheet, in turn.
const AREA_CLASSES = 6;
function areaClass(a) { return `a${a % AREA_CLASSES}`; }

let form = clone(boot.empty);
let leftOut = [];           // rows of the last list upload that could not be used
let drawing = null;         // {target: "outline" | [area, edge], points: [[x, y], ...]}
let shown = null;           // the answer on screen (may be out of date)
let latest = 0;             // id of the latest compute request
let controller = null;      // aborts the previous request
let timer = null;
let view = null;            // plan view box while drawing (kept still)
const libraryNames = {};

function clone(value) { return JSON.parse(JSON.stringify(value)); }
function $(selector, root = document) { return root.querySelector(selector); }
function $all(selector, root = document) { return Array.from(root.querySelectorAll(selector)); }
function el(tag, attrs = {}, text) {
  const node = document.createElement(tag);
  for (const [k, v] of Object.entries(attrs)) node.setAttribute(k, v);
  if (text !== undefined) node.textContent = text;
  return node;
}
function svg(tag, attrs = {}) {
  const node = document.createElementNS(SVG, tag);
  for (const [k, v] of Object.entries(attrs)) node.setAttribute(k, v);
  return node;
}
function sig(value, digits = 3) {
  if (value === null || value === undefined || !isFinite(value)) return "—";
  const text = Number(value).toPrecision(digits);
  return String(Number(text));
}

// ------------------------------------------------------------------------------------------
// Form values

function getPath(path) {
  return path.split(".").reduce((v, k) => (v === undefined || v === null ? undefined : v[k]), form);
}
function setPath(path, value) {
  const keys = path.split(".");
  let node = form;
  for (const k of keys.slice(0, -1)) node = node[k];
  node[keys[keys.length - 1]] = value;
}
function pointsText(points) {
  if (typeof points === "string") return points;
  return (points || []).map(([x, y]) => `${x}, ${y}`).join("; ");
}
function parsePoints(text) {
  // Pairs as numbers when the text reads as pairs; else the text itself, for the server to
  // name what is wrong beside the field.
  const parts = text.split(/[;\n]+/).map((p) => p.trim()).filter(Boolean);
  const out = [];
  for (const part of parts) {
    const numbers = part.replace(/^[([]|[)\]]$/g, "").split(/[,\s]+/).filter(Boolean);
    if (numbers.length !== 2) return text;
    const [x, y] = numbers.map(Number);
    if (!isFinite(x) || !isFinite(y)) return text;
    out.push([x, y]);
  }
  return out;
}

function fillChoices(select) {
  const name = select.dataset.choices;
  select.textContent = "";
  if (select.dataset.blank) select.append(el("option", { value: "" }, select.dataset.blank));
  for (const entry of boot.choices[name]) {
    const [value, label] = Array.isArray(entry) ? entry : [entry, entry];
    select.append(el("option", { value }, label));
  }
}
function setSelect(select, value) {
  if (value && !$all("option", select).some((o) => o.value === value)) {
    const alias = (boot.choices.terrain_aliases || {})[value];
    select.append(el("option", { value }, alias ? `${value} (${alias})` : value));
  }
  select.value = value || (select.dataset.blank ? "" : select.options[0]?.value || "");
}

function bindField(input) {
  const path = input.dataset.field;
  const points = "points" in input.dataset;
  const value = getPath(path);
  if (input.tagName === "SELECT") setSelect(input, value);
  else input.value = points ? pointsText(value) : value ?? "";
  if (input.tagName === "SELECT" && !value && input.value) setPath(path, input.value);
}

function renderFields() {
  for (const input of $all("[data-field]")) {
    if (input.closest("#areas") || input.closest("#object-rows")) continue;
    bindField(input);
  }
  const outward = !form.wind.from;
  $("#wind-outward").checked = outward;
  $("#wind-from").disabled = outward;
  renderLevels();
  renderAreas();
  renderObjects();
  renderPlan();
}

function onFieldInput(event) {
  const input = event.target;
  const path = input.dataset.field;
  if (!path) return;
  const value = "points" in input.dataset ? parsePoints(input.value) : input.value;
  setPath(path, value);
  clearError(input);
  if ("points" in input.dataset) renderPlan();
  changed();
}

function renderLevels() {
  const box = $("#levels");
  box.textContent = "";
  const chosen = form.policy.levels.length ? form.policy.levels : boot.choices.default_levels;
  for (const [key, label] of boot.choices.levels) {
    const input = el("input", { type: "checkbox", value: key });
    input.checked = chosen.includes(key);
    input.addEventListener("change", () => {
      form.policy.levels = $all("input", box).filter((i) => i.checked).map((i) => i.value);
      changed();
    });
    const row = el("label", { class: "check" });
    row.append(input, document.createTextNode(" " + label));
    box.append(row);
  }
}

// ------------------------------------------------------------------------------------------
// Work areas and edges

function renderAreas() {
  const box = $("#areas");
  box.textContent = "";
  form.work_areas.forEach((area, a) => {
    const node = $("#area-template").content.firstElementChild.cloneNode(true);
    node.classList.add(areaClass(a));
    for (const input of $all("[data-sub]", node)) {
      if (input.closest(".edges")) continue;
      const sub = input.dataset.sub;
      input.dataset.field = `work_areas.${a}.${sub}`;
      if (input.tagName === "SELECT") fillChoices(input);
      bindField(input);
    }
    const showFor = () => {
      for (const label of $all("[data-show]", node)) {
        label.hidden = !label.dataset.show.split(" ").includes(area.release || "drop");
      }
    };
    showFor();
    $("select", node).addEventListener("change", showFor);
    const edges = $(".edges", node);
    area.edges.forEach((edge, e) => {
      const row = $("#edge-template").content.firstElementChild.cloneNode(true);
      for (const input of $all("[data-sub]", row)) {
        input.dataset.field = `work_areas.${a}.edges.${e}.${input.dataset.sub}`;
        bindField(input);
      }
      const target = drawing && Array.isArray(drawing.target) &&
        drawing.target[0] === a && drawing.target[1] === e;
      if (target) row.classList.add("drawing");
      $(".draw-edge", row).addEventListener("click", () => startDrawing([a, e]));
      $(".remove-edge", row).addEventListener("click", () => {
        area.edges.splice(e, 1);
        renderAreas(); renderPlan(); changed();
      });
      edges.append(row);
    });
    $(".add-edge", node).addEventListener("click", () => {
      area.edges.push({ name: `edge ${area.edges.length + 1}`, height: "", points: [] });
      renderAreas(); changed();
    });
    $(".remove-area", node).addEventListener("click", () => {
      form.work_areas.splice(a, 1);
      renderAreas(); renderPlan(); changed();
    });
    box.append(node);
  });
}

$("#add-area").addEventListener("click", () => {
  const n = form.work_areas.length + 1;
  form.work_areas.push({
    name: `work area ${n}`, release: "drop", release_speed: "", release_angle: "",
    roof_pitch: "", roof_length: "", friction: "", rolling: "",
    edges: [{ name: "edge 1", height: "", points: [] }],
  });
  renderAreas(); changed();
});

// ------------------------------------------------------------------------------------------
// Objects

const OBJECT_FIELDS = ["id", "label", "quantity", "mass", "drag_area", "contact_area", "shape",
  "length", "width", "depth", "thickness", "diameter", "outer_diameter", "wall_thickness",
  "height"];
function newObject(values) {
  const obj = {};
  for (const k of OBJECT_FIELDS) obj[k] = values[k] ?? "";
  return obj;
}
function describeObject(obj) {
  if (obj.id) return obj.id;
  const parts = [];
  if (obj.mass) parts.push(obj.mass);
  if (obj.drag_area) parts.push(`Cd·A ${obj.drag_area}`);
  if (obj.shape) parts.push(obj.shape);
  if (obj.contact_area) parts.push(`contact ${obj.contact_area}`);
  return "custom: " + parts.join(", ");
}

function renderObjects() {
  const body = $("#object-rows");
  body.textContent = "";
  form.objects.forEach((obj, k) => {
    const row = el("tr", { "data-field": `objects.${k}` });
    const label = el("input", { "data-field": `objects.${k}.label`, "aria-label": "Item name" });
    label.value = obj.label;
    label.placeholder = libraryNames[obj.id] || obj.id || "name";
    const what = el("td", { class: "what" }, describeObject(obj));
    what.dataset.field = obj.id ? `objects.${k}.id` : `objects.${k}.mass`;
    const count = el("input", {
      "data-field": `objects.${k}.quantity`, class: "count", "aria-label": "Count",
    });
    count.value = obj.quantity;
    count.placeholder = "1";
    const remove = el("button", { type: "button", class: "danger-quiet" }, "Remove");
    remove.addEventListener("click", () => { form.objects.splice(k, 1); renderObjects(); changed(); });
    const cells = [el("td"), what, el("td", { class: "num" }), el("td")];
    cells[0].append(label); cells[2].append(count); cells[3].append(remove);
    row.append(...cells);
    body.append(row);
  });
  leftOut.forEach((bad, k) => {
    const row = el("tr", { class: "left-out" });
    row.append(
      el("td", {}, `row ${bad.row}: ${bad.label || bad.id || "(no name)"}`),
      el("td", { class: "row-error" }, `left out: ${bad.message}`),
      el("td"),
    );
    const cell = el("td");
    const dismiss = el("button", { type: "button", class: "danger-quiet" }, "Dismiss");
    dismiss.addEventListener("click", () => { leftOut.splice(k, 1); renderObjects(); });
    cell.append(dismiss); row.append(cell);
    body.append(row);
  });
  if (!form.objects.length && !leftOut.length) {
    const row = el("tr");
    row.append(el("td", { colspan: "4", class: "quiet" }, "No objects yet: add them from the library, as custom objects or from a list."));
    body.append(row);
  }
}

$("#object-rows").addEventListener("input", (event) => {
  const input = event.target;
  if (!input.dataset.field) return;
  setPath(input.dataset.field, input.value);
  clearError(input);
  changed();
});

let libraryTimer = null;
function searchLibrary() {
  clearTimeout(libraryTimer);
  libraryTimer = setTimeout(async () => {
    const params = new URLSearchParams({
      search: $("#library-search").value, category: $("#library-category").value,
    });
    const response = await fetch(`/api/library?${params}`);
    const data = await response.json();
    const list = $("#library-list");
    list.textContent = "";
    showError("library", response.ok ? "" : data.errors[0].message);
    if (!response.ok) return;
    const categories = $("#library-category");
    if (categories.options.length === 1) {
      for (const c of data.categories) categories.append(el("option", { value: c }, c.replaceAll("-", " ")));
    }
    for (const obj of data.objects) {
      libraryNames[obj.id] = obj.name;
      const card = el("div", { class: "library-item", "data-id": obj.id });
      const text = el("div", { class: "library-text" });
      text.append(
        el("strong", {}, obj.name),
        el("span", { class: "quiet" }, ` · ${obj.category.replaceAll("-", " ")}`),
        el("div", { class: "facts" },
          `${sig(obj.mass_kg)} kg · Cd·A ${sig(obj.drag_area_min_m2)}–${sig(obj.drag_area_max_m2)} m²` +
          (obj.glides ? " · can glide" : "")),
        el("div", { class: "source" }, obj.source),
      );
      const add = el("button", { type: "button", class: "add" }, "Add");
      add.addEventListener("click", () => {
        const existing = form.objects.find((o) => o.id === obj.id && !o.label);
        if (existing) existing.quantity = String((parseInt(existing.quantity, 10) || 1) + 1);
        else form.objects.push(newObject({ id: obj.id, quantity: "1" }));
        renderObjects(); changed();
      });
      card.append(text, add);
      list.append(card);
    }
    if (!data.objects.length) list.append(el("p", { class: "quiet" }, "Nothing matches."));
    list.dataset.search = params.toString();  // which search the list shows (for tests)
  }, 150);
}
$("#library-search").addEventListener("input", searchLibrary);
$("#library-category").addEventListener("change", searchLibrary);

$("#custom-add").addEventListener("click", () => {
  form.objects.push(newObject({
    label: $("#custom-label").value.trim(), mass: $("#custom-mass").value.trim(),
    drag_area: $("#custom-drag").value.trim(), contact_area: $("#custom-contact").value.trim(),
    quantity: $("#custom-quantity").value.trim() || "1",
  }));
  for (const id of ["#custom-label", "#custom-mass", "#custom-drag", "#custom-contact"]) $(id).value = "";
  $("#custom-quantity").value = "1";
  renderObjects(); changed();
});

$("#list-file").addEventListener("change", async (event) => {
  const file = event.target.files[0];
  if (!file) return;
  const data = new FormData();
  data.append("file", file);
  const response = await fetch("/api/objects", { method: "POST", body: data });
  const answer = await readJson(response);
  event.target.value = "";
  if (!response.ok) { showError("file", answer.errors[0].message); return; }
  showError("file", "");
  for (const obj of answer.objects) form.objects.push(newObject(obj));
  leftOut = answer.row_errors;
  renderObjects(); changed();
});

// ------------------------------------------------------------------------------------------
// The plan

function planBounds() {
  const xs = [], ys = [];
  const add = (points) => { if (Array.isArray(points)) for (const [x, y] of points) { xs.push(x); ys.push(y); } };
  add(form.outline);
  for (const area of form.work_areas) for (const edge of area.edges) add(edge.points);
  if (drawing) add(drawing.points);
  if (shown) for (const area of shown.areas) for (const poly of area.zone) for (const ring of poly) add(ring);
  if (!xs.length) return { x0: -5, y0: -5, x1: 35, y1: 25 };
  let [x0, x1, y0, y1] = [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
  const pad = Math.max(3, 0.08 * Math.max(x1 - x0, y1 - y0));
  x0 -= pad; x1 += pad; y0 -= pad; y1 += pad;
  const min = 20;
  if (x1 - x0 < min) { const c = (x0 + x1) / 2; x0 = c - min / 2; x1 = c + min / 2; }
  if (y1 - y0 < min) { const c = (y0 + y1) / 2; y0 = c - min / 2; y1 = c + min / 2; }
  return { x0, y0, x1, y1 };
}

function renderPlan() {
  const plan = $("#plan");
  plan.textContent = "";
  const b = view || planBounds();
  if (drawing && !view) view = b;
  plan.setAttribute("viewBox", `${b.x0} ${-b.y1} ${b.x1 - b.x0} ${b.y1 - b.y0}`);
  const span = Math.max(b.x1 - b.x0, b.y1 - b.y0);
  const step = span > 400 ? 20 : span > 150 ? 10 : span > 60 ? 5 : 1;
  const world = svg("g", { transform: "scale(1,-1)", id: "plan-world" });
  const grid = svg("g", { class: "grid" });
  for (let x = Math.ceil(b.x0 / step) * step; x <= b.x1; x += step) {
    grid.append(svg("line", { x1: x, y1: b.y0, x2: x, y2: b.y1, class: x % (step * 5) === 0 ? "major" : "" }));
  }
  for (let y = Math.ceil(b.y0 / step) * step; y <= b.y1; y += step) {
    grid.append(svg("line", { x1: b.x0, y1: y, x2: b.x1, y2: y, class: y % (step * 5) === 0 ? "major" : "" }));
  }
  world.append(grid);
  const labels = svg("g", { class: "labels" });
  const fontSize = span / 45;
  const label = (x, y, text, cls) => {
    // Anchored so that a label near a side of the view stays inside it.
    const middle = (b.x0 + b.x1) / 2, quarter = (b.x1 - b.x0) / 4;
    const anchor = x > middle + quarter ? "end" : x < middle - quarter ? "start" : "middle";
    const t = svg("text", { x, y: -y, class: cls, "font-size": fontSize, "text-anchor": anchor });
    t.textContent = text;
    labels.append(t);
  };
  if (shown) {
    shown.areas.forEach((area, a) => {
      const d = area.zone.map((poly) => poly.map((ring) =>
        "M" + ring.map(([x, y]) => `${x},${y}`).join("L") + "Z").join("")).join("");
      if (d) {
        world.append(svg("path", {
          d, class: `zone ${areaClass(a)}` + (isCurrent() ? "" : " stale"), "fill-rule": "evenodd",
        }));
      }
    });
  }
  if (Array.isArray(form.outline) && form.outline.length >= 2) {
    world.append(svg("polygon", { points: form.outline.map((p) => p.join(",")).join(" "), class: "outline" }));
  }
  form.work_areas.forEach((area, a) => {
    area.edges.forEach((edge) => {
      if (!Array.isArray(edge.points) || edge.points.length < 1) return;
      world.append(svg("polyline", {
        points: edge.points.map((p) => p.join(",")).join(" "), class: `edge ${areaClass(a)}`,
      }));
      const [[xa, ya], [xb, yb]] = [edge.points[0], edge.points[1] || edge.points[0]];
      label((xa + xb) / 2, (ya + yb) / 2 + fontSize * 0.6,
        `${edge.name || "edge"}${edge.height ? " · " + edge.height : ""}`, "edge-label");
    });
  });
  if (drawing) {
    world.append(svg("polyline", { points: drawing.points.map((p) => p.join(",")).join(" "), class: "sketch" }));
    for (const [x, y] of drawing.points) world.append(svg("circle", { cx: x, cy: y, r: span / 150, class: "sketch-point" }));
  }
  plan.append(world, labels);
  // North arrow and a scale bar, in screen-fixed corners of the view.
  const n = svg("g", { class: "north" });
  const nx = b.x1 - span / 25, ny = -b.y1 + span / 14;
  n.append(svg("path", { d: `M${nx},${ny - span / 25}L${nx - span / 80},${ny}L${nx + span / 80},${ny}Z` }));
  const nt = svg("text", { x: nx, y: ny + fontSize * 1.2, "font-size": fontSize, "text-anchor": "middle" });
  nt.textContent = "N";
  n.append(nt);
  const bar = step * (span > 60 ? 2 : 5);
  const sx = b.x0 + span / 30, sy = -b.y0 - span / 30;
  n.append(svg("rect", { x: sx, y: sy - span / 200, width: bar, height: span / 100, class: "scale" }));
  const st = svg("text", { x: sx, y: sy - span / 60, "font-size": fontSize });
  st.textContent = `${bar} m`;
  n.append(st);
  const speed = (form.wind.speed || "").trim();
  const wind = !speed || /^0+(\.0*)?(\s*\S+)?$/.test(speed) ? "still air" :
    `wind ${speed}` + (form.wind.from ? ` from ${form.wind.from}` : ", straight out from each edge");
  const wt = svg("text", { x: b.x0 + span / 40, y: -b.y1 + span / 25, "font-size": fontSize, class: "wind-note" });
  wt.textContent = wind;
  n.append(wt);
  plan.append(n);
}

function startDrawing(target) {
  drawing = { target, points: [] };
  view = null;
  const name = target === "outline" ? "the building outline" :
    `${form.work_areas[target[0]].edges[target[1]].name || "edge"} (${form.work_areas[target[0]].name})`;
  $("#draw-target").textContent = `Drawing ${name}: click points, then Finish line`;
  $("#draw-finish").disabled = false;
  $("#draw-cancel").disabled = false;
  $("#plan").classList.add("drawing");
  renderAreas(); renderPlan();
}
function stopDrawing(keep) {
  if (keep && drawing && drawing.points.length >= 2) {
    if (drawing.target === "outline") form.outline = drawing.points;
    else form.work_areas[drawing.target[0]].edges[drawing.target[1]].points = drawing.points;
    changed();
  }
  drawing = null; view = null;
  $("#draw-target").textContent = "";
  $("#draw-finish").disabled = true;
  $("#draw-cancel").disabled = true;
  $("#plan").classList.remove("drawing");
  renderFields();
}
$("#draw-outline").addEventListener("click", () => startDrawing("outline"));
$("#draw-finish").addEventListener("click", () => stopDrawing(true));
$("#draw-cancel").addEventListener("click", () => stopDrawing(false));
$("#plan").addEventListener("click", (event) => {
  if (!drawing) return;
  const world = $("#plan-world");
  const point = $("#plan").createSVGPoint();
  point.x = event.clientX; point.y = event.clientY;
  const at = point.matrixTransform(world.getScreenCTM().inverse());
  const snap = (v) => Math.round(v * 2) / 2;
  const next = [snap(at.x), snap(at.y)];
  const last = drawing.points[drawing.points.length - 1];
  if (!last || last[0] !== next[0] || last[1] !== next[1]) drawing.points.push(next);
  renderPlan();
});

// ------------------------------------------------------------------------------------------
// Errors beside fields

function showError(field, message) {
  for (const node of $all(`[data-error-for="${CSS.escape(field)}"]`)) {
    node.textContent = message || "";
    node.hidden = !message;
  }
}
function clearError(input) {
  input.classList.remove("invalid");
  const note = input.parentElement && input.parentElement.querySelector(":scope > .field-error");
  if (note) note.remove();
}
function clearErrors() {
  for (const node of $all(".invalid")) node.classList.remove("invalid");
  for (const node of $all(".field-error")) node.remove();
}
function showFieldErrors(errors) {
  clearErrors();
  const loose = [];
  for (const error of errors) {
    let path = error.field;
    let target = null;
    while (path && !target) {
      target = $(`[data-field="${CSS.escape(path)}"]`);
      if (!target) path = path.split(".").slice(0, -1).join(".");
    }
    if (!target) { loose.push(error.message); continue; }
    target.classList.add("invalid");
    const note = el("span", { class: "field-error", role: "alert" }, error.message);
    if (target.tagName === "TR") {
      const cell = target.querySelector("td.what") || target.lastElementChild;
      cell.append(note);
    } else {
      (target.closest("label") || target.parentElement).append(note);
    }
    if (target.closest("details")) target.closest("details").open = true;
  }
  return loose;
}

// ------------------------------------------------------------------------------------------
// Computing the answer

function isCurrent() { return $("#answer").dataset.state === "current"; }
function setState(state, text) {
  $("#answer").dataset.state = state;
  $("#status").textContent = text;
}

function ready() {
  const edge = form.work_areas.some((a) => a.edges.some((e) =>
    (typeof e.points === "string" || e.points.length >= 2) && e.height));
  return form.objects.length > 0 && edge;
}

function changed() {
  latest += 1;  // any answer on its way is now out of date
  if (controller) controller.abort();
  clearTimeout(timer);
  if (shown) {
    setState("stale", "Inputs changed: the answer below is for the previous inputs.");
    renderPlan();
  }
  timer = setTimeout(compute, 600);
}

async function compute() {
  if (!ready()) {
    setState(shown ? "stale" : "empty",
      "Add at least one work edge (points and a height) and one object to get an answer.");
    return;
  }
  const id = ++latest;
  controller = new AbortController();
  const started = performance.now();
  setState("computing", "Computing…");
  $("#answer").dataset.request = String(id);
  let response, answer;
  try {
    response = await fetch("/api/compute", {
      method: "POST", headers: { "Content-Type": "application/json" },
      body: JSON.stringify({ request_id: id, form }), signal: controller.signal,
    });
    answer = await readJson(response);
  } catch (error) {
    if (error.name === "AbortError") return;
    if (id === latest) setState("error", "The page lost its server: is `dropcalc serve` still running?");
    return;
  }
  if (id !== latest || answer.request_id !== id) return;  // a newer request is on its way
  if (!response.ok) {
    const loose = showFieldErrors(answer.errors || []);
    const count = (answer.errors || []).length;
    setState("error", loose.length ? loose.join(" ") :
      `Fix the marked field${count === 1 ? "" : "s"}: ${answer.errors.map((e) => e.message).join(" · ")}`);
    return;
  }
  clearErrors();
  shown = answer;
  showAnswer(answer);
  const seconds = (performance.now() - started) / 1000;
  setState("current", `Up to date · computed in ${seconds.toFixed(1)} s` +
    (answer.cached ? " (from the cache)" : ""));
  $("#answer").dataset.shown = String(id);
  renderPlan();
  drawFigures(id);
}

async function readJson(response) {
  try { return await response.json(); } catch (e) {
    return { errors: [{ field: "", message: `the server answered ${response.status}` }] };
  }
}

function showAnswer(answer) {
  const cards = $("#area-cards");
  cards.textContent = "";
  answer.areas.forEach((area, a) => {
    const card = el("article", { class: `card ${areaClass(a)}`, "data-area": String(a) });
    card.append(el("h3", {}, area.name));
    if (area.finite) {
      const big = el("p", { class: "distance" });
      big.append(el("span", { class: "keep" }, "Keep "), el("strong", { class: "metres" }, area.keep_clear),
        el("span", { class: "unit" }, " m"), el("span", { class: "keep" }, " clear"));
      card.append(big);
      card.append(el("p", { class: "basis" },
        `from the work edge: ${area.confidence_text} of simulated drops land inside, ` +
        `${area.margin_text} margin included`));
    } else {
      card.append(el("p", { class: "distance none" }, area.keep_clear_text));
    }
    const facts = el("dl", { class: "facts" });
    const fact = (k, v) => { facts.append(el("dt", {}, k), el("dd", {}, v)); };
    fact("Worst case", area.worst_case_text);
    fact("Set by", `${area.driving_object} (edge ${area.driving_edge})`);
    fact("Made of", `drift ${sig(area.drift_m)} m + scatter ${sig(area.scatter_m)} m + margin ${sig(area.margin_m)} m`);
    fact("Edges", area.heights_text);
    fact("Release", area.release);
    fact("Area to fence", `${Math.round(area.area_m2).toLocaleString("en")} m²`);
    if (area.clear_distance_m !== null) {
      fact("Stop work above", area.stop_work_wind_m_s > 0
        ? `${sig(area.stop_work_wind_m_s)} m/s mean wind at 10 m (zone within the ${sig(area.clear_distance_m)} m available)`
        : `the ${sig(area.clear_distance_m)} m available is too small even in still air`);
    }
    card.append(facts);
    for (const w of area.driver_warnings) card.append(el("p", { class: "card-warning" }, w));
    cards.append(card);
  });
  $("#caution-short").textContent = answer.caution;
  $("#wind-basis").textContent = answer.wind_basis ? `Wind: ${answer.wind_basis}` : "";
  const warnings = $("#warnings");
  warnings.textContent = "";
  for (const w of answer.warnings) warnings.append(el("li", {}, w));
  $("#warnings-box").hidden = !answer.warnings.length;
  const controls = $("#controls");
  controls.textContent = "";
  for (const { item, controls: list } of answer.controls) {
    const row = el("tr");
    const cell = el("td");
    if (list.length === 1) cell.textContent = list[0];
    else {
      const ul = el("ul", { class: "tight" });
      for (const c of list) ul.append(el("li", {}, c));
      cell.append(ul);
    }
    row.append(el("td", {}, item), cell);
    controls.append(row);
  }
  $("#controls-box").hidden = !answer.controls.length;
  const impacts = $("#impacts tbody");
  impacts.textContent = "";
  for (const row of answer.objects) {
    const tr = el("tr");
    if (row.error) {
      tr.append(el("td", {}, row.label), el("td", { colspan: "6", class: "row-error" }, row.error));
    } else {
      tr.append(
        el("td", {}, row.label), el("td", { class: "num" }, String(row.quantity)),
        el("td", { class: "num" }, `${sig(row.mass_kg)} kg`),
        el("td", { class: "num" }, `${sig(row.impact_speed_m_s)} m/s`),
        el("td", { class: "num" }, `${sig(row.impact_energy_j)} J`),
        el("td", {}, row.levels || "none"),
        el("td", { class: "num" }, row.zone_text),
      );
    }
    impacts.append(tr);
  }
  $("#impacts-box").hidden = !answer.objects.length;
  // The figures take longer than the numbers: the old ones go at once, the new ones follow.
  for (const id of ["#figure-side", "#figure-energy"]) $(id).removeAttribute("src");
  $("#figures-box").hidden = false;
  $("#figures-box").dataset.state = "drawing";
}

async function drawFigures(id) {
  let response, answer;
  try {
    response = await fetch("/api/figures", {
      method: "POST", headers: { "Content-Type": "application/json" },
      body: JSON.stringify({ request_id: id, form }), signal: controller.signal,
    });
    answer = await readJson(response);
  } catch (error) { return; }
  if (id !== latest || !response.ok || answer.request_id !== id) return;
  $("#figure-side").src = answer.figures.side_view;
  $("#figure-energy").src = answer.figures.energy_height;
  $("#figures-box").dataset.state = "drawn";
}

// ------------------------------------------------------------------------------------------
// Documents, new job, demo, scenario upload

$("#download-form").addEventListener("submit", async (event) => {
  event.preventDefault();
  const kind = event.submitter ? event.submitter.dataset.document : "pdf";
  const button = event.submitter;
  if (button) { button.disabled = true; button.classList.add("busy"); }
  showError("download", "");
  try {
    const response = await fetch(`/download/${kind}`, {
      method: "POST", headers: { "Content-Type": "application/json" }, body: JSON.stringify(form),
    });
    if (!response.ok) {
      const answer = await readJson(response);
      showFieldErrors(answer.errors || []);
      showError("download", answer.errors.map((e) => e.message).join(" · "));
      return;
    }
    const disposition = response.headers.get("content-disposition") || "";
    const name = (disposition.match(/filename="([^"]+)"/) || [])[1] || `dropcalc.${kind}`;
    const blob = await response.blob();
    const link = el("a", { href: URL.createObjectURL(blob), download: name });
    document.body.append(link);
    link.click();
    link.remove();
    setTimeout(() => URL.revokeObjectURL(link.href), 10000);
  } finally {
    if (button) { button.disabled = false; button.classList.remove("busy"); }
  }
});

function loadForm(next, rows = []) {
  form = next;
  leftOut = rows;
  shown = null;
  drawing = null; view = null;
  clearErrors();
  $("#area-cards").textContent = "";
  for (const id of ["#warnings-box", "#controls-box", "#impacts-box", "#figures-box"]) $(id).hidden = true;
  setState("empty", "");
  renderFields();
  changed();
}
$("#new-job").addEventListener("click", () => loadForm(clone(boot.empty)));
$("#load-demo").addEventListener("click", async () => {
  const response = await fetch("/api/demo");
  loadForm((await response.json()).form);
});
$("#scenario-file").addEventListener("change", async (event) => {
  const files = Array.from(event.target.files);
  event.target.value = "";
  const data = new FormData();
  const scenario = files.find((f) => /\.toml$/i.test(f.name));
  const list = files.find((f) => /\.(csv|xlsx)$/i.test(f.name));
  if (!scenario) { showError("scenario", "Choose a scenario file (.toml), with its object list if it names one."); return; }
  data.append("scenario", scenario);
  if (list) data.append("list", list);
  const response = await fetch("/api/scenario", { method: "POST", body: data });
  const answer = await readJson(response);
  if (!response.ok) { showError("scenario", answer.errors[0].message); return; }
  showError("scenario", "");
  loadForm(answer.form, answer.row_errors);
  if (answer.errors.length) showFieldErrors(answer.errors);
});

$("#wind-outward").addEventListener("change", (event) => {
  $("#wind-from").disabled = event.target.checked;
  if (event.target.checked) { form.wind.from = ""; $("#wind-from").value = ""; }
  changed();
});

document.addEventListener("input", (event) => {
  if (event.target.closest("#object-rows")) return;
  if (event.target.dataset.field) onFieldInput(event);
});
document.addEventListener("change", (event) => {
  if (event.target.tagName === "SELECT" && event.target.dataset.field) onFieldInput(event);
});

for (const select of $all("select[data-choices]")) fillChoices(select);
renderFields();
searchLibrary();
setState("empty", "Fill in the job, or start from the demo.");
