// The study page: holds the unit file and weather as text, sends them with every request to
// the server that printed this page's URL, and shows what comes back. No other network.
"use strict";

const token = new URLSearchParams(location.search).get("token") || "";
const state = { unit: "", unitName: "", weather: "", weatherName: "", byHeader: false,
                demo: false, units: "", axes: null, chartBox: null, previous: {} };
let generation = 0;  // only the latest request's answer is shown

const $ = (id) => document.getElementById(id);

function status(text, kind) {
  const s = $("status");
  s.textContent = text;
  s.className = "status" + (kind ? " " + kind : "");
}

// POST (or GET without fields) to /api/NAME; resolves to {ok, status, data} with the JSON or
// blob answer, never rejects on an HTTP error.
async function api(name, fields, asBlob) {
  const init = { method: fields ? "POST" : "GET", headers: { "X-Limitline-Token": token } };
  if (fields) {
    const form = new FormData();
    for (const [k, v] of fields) {
      if (k === "unit" || k === "weather") form.append(k, new Blob([v], { type: "text/plain" }), k);
      else form.append(k, v);
    }
    init.body = form;
  }
  let res;
  try {
    res = await fetch("/api/" + name, init);
  } catch (e) {
    return { ok: false, status: 0, data: { error: "the server does not answer: " + e.message } };
  }
  if (res.ok && asBlob) return { ok: true, status: res.status, data: await res.blob() };
  let data;
  try { data = await res.json(); } catch (e) { data = { error: "HTTP " + res.status }; }
  return { ok: res.ok, status: res.status, data };
}

function unitFields() {
  return [["unit", state.unit], ["unit_name", state.unitName.replace(/ \(edited\)$/, "")]];
}

function studyFields() {
  const f = unitFields().concat([["weather", state.weather], ["weather_name", state.weatherName]]);
  if (state.byHeader) f.push(["weather_by_header", "1"]);
  if (state.units) f.push(["units", state.units]);
  return f;
}

function showInputs() {
  $("unit-name").textContent = state.unitName;
  $("weather-name").textContent = state.weatherName;
  $("by-header").checked = state.byHeader;
}

function inputError(text) {
  const e = $("input-error");
  e.textContent = text || "";
  e.hidden = !text;
}

async function loadStart(data) {
  state.unit = data.unit;
  state.unitName = data.unit_name;
  state.weather = data.weather;
  state.weatherName = data.weather_name;
  state.byHeader = data.weather_by_header;
  state.demo = data.demo;
  state.weatherFile = data.weather_file;
  if (data.units) state.units = data.units;
  $("units").value = state.units;
  showInputs();
  await loadFields();
  await refresh();
}

// The settings form, from the fields the server finds in the unit file.
async function loadFields() {
  const r = await api("fields", unitFields());
  const form = $("settings");
  form.textContent = "";
  if (!r.ok) { inputError(r.data.error); return; }
  let group = "";
  for (const f of r.data.fields) {
    const g = f.path.startsWith("strategy[") ? "Strategies" : f.path.split(".")[0].replace("_", " ");
    if (g !== group) {
      group = g;
      const h = document.createElement("div");
      h.className = "group";
      h.textContent = g;
      form.append(h);
    }
    const wrap = document.createElement("div");
    wrap.className = "field";
    const id = "f-" + f.path.replace(/[^a-z0-9]/gi, "-");
    const label = document.createElement("label");
    label.htmlFor = id;
    label.textContent = f.label;
    const input = document.createElement("input");
    input.type = "text";
    input.id = id;
    input.value = f.value;
    input.dataset.path = f.path;
    input.placeholder = "default";
    const err = document.createElement("p");
    err.className = "error";
    err.hidden = true;
    wrap.append(label, input, err);
    form.append(wrap);
    input.addEventListener("change", () => applyEdit(input, err));
  }
}

async function applyEdit(input, err) {
  status("checking " + input.dataset.path + "…", "busy");
  const r = await api("edit", unitFields().concat([["path", input.dataset.path], ["value", input.value]]));
  if (!r.ok) {
    input.classList.add("invalid");
    err.textContent = r.data.error;
    err.hidden = false;
    status("not applied: " + input.dataset.path, "bad");
    return;
  }
  input.classList.remove("invalid");
  err.hidden = true;
  state.unit = r.data.unit;
  state.unitName = state.unitName.replace(/( \(edited\))?$/, " (edited)");
  showInputs();
  await refresh();
}

function energyKey(year, prefix) {
  if (year.ranking_basis === "cost") return [prefix + "_cost", year.currency];
  return year.units === "si" ? [prefix + "_kwh", "kWh"] : [prefix + "_kbtu", "kBtu"];
}

function fmt(v, digits) {
  if (v === null || v === undefined) return "–";
  return Number(v).toLocaleString("en-US", { maximumFractionDigits: digits, minimumFractionDigits: digits });
}

function renderRanking(year) {
  const [shortKey, unit] = energyKey(year, "shortfall_vs_perfect");
  const [saveKey] = energyKey(year, "savings_vs_no_economizer");
  const cols = ["#", "strategy", "code", "shortfall " + unit, "savings " + unit,
                "economizing h", "harmful h", "missed h"];
  const head = $("ranking").tHead;
  head.textContent = "";
  const hr = head.insertRow();
  cols.forEach((c, i) => {
    const th = document.createElement("th");
    th.textContent = c;
    if (i === 1) th.className = "name";
    hr.append(th);
  });
  const body = $("ranking").tBodies[0];
  body.textContent = "";
  const rows = year.ranking.map((n, i) => [String(i + 1), n]);
  for (const n of Object.keys(year.results))
    if (!year.ranking.includes(n)) rows.push(["", n]);
  const digits = year.ranking_basis === "cost" ? 2 : 0;
  const now = {};
  for (const [rank, name] of rows) {
    const r = year.results[name];
    const tr = body.insertRow();
    tr.dataset.strategy = name;
    if (r.kind !== "strategy") tr.className = "reference";
    else if (name === year.best) tr.className = "best";
    const cells = [rank, name, r.compliance || (r.kind === "strategy" ? "–" : ""),
                   r.kind === "strategy" ? fmt(r[shortKey], digits) : "",
                   fmt(r[saveKey], digits), fmt(r.hours_economizing, 0),
                   r.kind === "strategy" ? fmt(r.harmful_hours, 0) : "",
                   r.kind === "strategy" ? fmt(r.missed_hours, 0) : ""];
    cells.forEach((c, i) => {
      const td = tr.insertCell();
      td.textContent = c;
      if (i === 1) td.className = "name";
      if (i === 2 && c) td.className = "verdict-" + c;
      const key = name + "|" + i;
      now[key] = c;
      if (state.previous[key] !== undefined && state.previous[key] !== c) td.classList.add("changed");
    });
  }
  state.previous = now;
  $("basis").textContent = "Ranked by " + (year.ranking_basis === "cost" ? "cost" : "energy") +
      " shortfall against the perfect changeover; " + fmt(year.operating_hours, 0) +
      " fan-on hours. " + (year.energy_code || "No energy code named in [site].");
  fillList("recommendation", year.recommendation ? year.recommendation.lines : []);
  fillList("warnings", year.warnings);
  fillList("cautions", year.cautions);
}

function fillList(id, lines) {
  const ul = $(id);
  ul.textContent = "";
  for (const l of lines || []) {
    const li = document.createElement("li");
    li.textContent = l;
    ul.append(li);
  }
}

function svgImage(img, svg) {
  if (img.dataset.url) URL.revokeObjectURL(img.dataset.url);
  const url = URL.createObjectURL(new Blob([svg], { type: "image/svg+xml" }));
  img.dataset.url = url;
  img.src = url;
}

// The SVG's viewBox, so that a click on the scaled image maps back to the chart's own units.
function viewBox(svg) {
  const m = /viewBox="([-\d.\s]+)"/.exec(svg);
  if (!m) return null;
  const [x, y, w, h] = m[1].trim().split(/\s+/).map(Number);
  return { x, y, w, h };
}

async function refresh() {
  const mine = ++generation;
  status("computing…", "busy");
  const started = performance.now();
  const r = await api("study", studyFields());
  if (mine !== generation) return;
  if (!r.ok) {
    inputError(r.data.error);
    status("error: see Inputs", "bad");
    return;
  }
  inputError("");
  const d = r.data;
  renderRanking(d.year);
  state.axes = d.chart.axes;
  state.chartBox = viewBox(d.chart.svg);
  svgImage($("chart"), d.chart.svg);
  // The map of the chart's axes, for tools that place a point on it as the click handler does.
  $("chart").dataset.axes = JSON.stringify(Object.assign({ view_box: state.chartBox }, state.axes));
  svgImage($("monthly"), d.monthly_svg);
  const t = $("tuning");
  t.textContent = "";
  for (const p of d.tuning) {
    const fig = document.createElement("figure");
    const img = document.createElement("img");
    img.alt = "Loss against setting: " + p.strategy;
    svgImage(img, p.svg);
    const cap = document.createElement("figcaption");
    cap.textContent = p.strategy;
    fig.append(img, cap);
    t.append(fig);
  }
  document.body.dataset.results = String(mine);
  status("up to date (" + Math.round(performance.now() - started) + " ms)");
}

async function checkClick(ev) {
  const img = $("chart"), a = state.axes, box = state.chartBox;
  if (!a || !box) return;
  const x = box.x + ev.offsetX / img.clientWidth * box.w;
  const y = box.y + ev.offsetY / img.clientHeight * box.h;
  const div = $("check");
  div.hidden = false;
  if (x < a.left || x > a.left + a.width || y < a.top || y > a.top + a.height) {
    div.textContent = "Click inside the plot area.";
    return;
  }
  const t = a.dry_bulb_min_c + (x - a.left) / a.width * (a.dry_bulb_max_c - a.dry_bulb_min_c);
  const w = a.humidity_ratio_max * (a.top + a.height - y) / a.height;
  const outdoor = t.toFixed(2) + "C/w" + w.toFixed(5);
  const f = unitFields().concat([["outdoor", outdoor]]);
  if (state.units) f.push(["units", state.units]);
  const r = await api("check", f);
  div.textContent = "";
  if (!r.ok) { div.textContent = r.data.error; return; }
  const c = r.data;
  const p = document.createElement("p");
  const db = c.units === "si" ? fmt(c.outdoor.dry_bulb_c, 1) + " °C" : fmt(c.outdoor.dry_bulb_f, 1) + " °F";
  const dp = c.units === "si" ? fmt(c.outdoor.dew_point_c, 1) + " °C" : fmt(c.outdoor.dew_point_f, 1) + " °F";
  p.textContent = "Outdoor " + db + ", dew point " + dp + ", RH " + fmt(100 * c.outdoor.relative_humidity, 0) +
      " %: the perfect changeover " + (c.perfect_changeover.enables ? "economizes" : "does not economize") +
      (c.cooling_needed ? "." : " (no cooling needed).");
  const ul = document.createElement("ul");
  ul.className = "plain";
  for (const s of c.strategies) {
    const li = document.createElement("li");
    li.textContent = s.name + ": " + (s.economizer_enabled ? "economizer enabled" : "economizer off") +
        " — " + s.verdict.replace(/_/g, " ");
    ul.append(li);
  }
  const cmd = document.createElement("p");
  cmd.className = "hint";
  cmd.textContent = "Same as: limitline check unit.toml --outdoor " + outdoor;
  div.append(p, ul, cmd);
}

function download(blob, name) {
  const a = document.createElement("a");
  a.href = URL.createObjectURL(blob);
  a.download = name;
  document.body.append(a);
  a.click();
  setTimeout(() => { URL.revokeObjectURL(a.href); a.remove(); }, 1000);
}

function readFile(input) {
  return new Promise((resolve, reject) => {
    const f = input.files[0];
    if (!f) return reject(new Error("no file"));
    const r = new FileReader();
    r.onload = () => resolve({ name: f.name, text: r.result });
    r.onerror = () => reject(r.error);
    r.readAsText(f);
  });
}

async function init() {
  $("unit-file").addEventListener("change", async (ev) => {
    const f = await readFile(ev.target);
    const check = await api("fields", [["unit", f.text], ["unit_name", f.name]]);
    if (!check.ok) { inputError(check.data.error); return; }
    Object.assign(state, { unit: f.text, unitName: f.name, demo: false, byHeader: false });
    showInputs();
    await loadFields();
    await refresh();
  });
  $("weather-file").addEventListener("change", async (ev) => {
    const f = await readFile(ev.target);
    Object.assign(state, { weather: f.text, weatherName: f.name, weatherFile: f.name,
                           byHeader: state.demo || state.byHeader });
    showInputs();
    await refresh();
  });
  $("by-header").addEventListener("change", (ev) => { state.byHeader = ev.target.checked; refresh(); });
  $("units").addEventListener("change", (ev) => { state.units = ev.target.value; refresh(); });
  $("demo").addEventListener("change", async (ev) => {
    if (!ev.target.value) return;
    const r = await api("demo", [["name", ev.target.value]]);
    ev.target.value = "";
    if (r.ok) await loadStart(r.data); else inputError(r.data.error);
  });
  $("chart").addEventListener("click", checkClick);
  $("dl-unit").addEventListener("click", async () => {
    const f = unitFields();
    if (state.weatherFile) {
      f.push(["weather_file", state.weatherFile]);
      if (state.byHeader) f.push(["weather_by_header", "1"]);
    }
    const r = await api("unit", f, true);
    if (!r.ok) { status("unit file: " + r.data.error, "bad"); return; }
    const base = state.unitName.replace(/ \(edited\)$/, "").replace(/.*[\\/]/, "").replace(/\.toml$/i, "");
    download(r.data, (base || "unit") + ".toml");
  });
  $("dl-report").addEventListener("click", async () => {
    status("writing the report…", "busy");
    const r = await api("report", studyFields(), true);
    if (!r.ok) { status("report: " + r.data.error, "bad"); return; }
    download(r.data, "limitline-study.html");
    status("report downloaded");
  });
  const r = await api("start");
  if (!r.ok) { status(r.data.error, "bad"); return; }
  for (const n of r.data.demos) {
    const o = document.createElement("option");
    o.value = n;
    o.textContent = n;
    $("demo").append(o);
  }
  await loadStart(r.data);
}

init();
