// The builder page: reads the form, asks the server for a preview of seven
// days from the date chosen (/at.json) and shows the subscribe links it returns.
// The form may open filled by the server from the page's query (the table's
// "make another" link): the preview is asked for as soon as the page loads.
"use strict";

// parseAngle reads decimal degrees ("-33.45") or degrees, minutes and
// seconds with a hemisphere letter ("33°27′S", "33 27 0 S", "S 33.45").
// neg is the letter that makes the value negative ("S" or "W"); pos the
// other. It returns a number or null.
function parseAngle(text, pos, neg) {
  let s = text.trim().toUpperCase().replace(",", ".");
  if (s === "") return null;
  let sign = 1;
  const letters = s.match(/[NSEW]/g);
  if (letters) {
    if (letters.length > 1) return null;
    if (letters[0] === neg) sign = -1;
    else if (letters[0] !== pos) return null;
    s = s.replace(/[NSEW]/, " ");
  }
  if (/^\s*[+-]?\d+(\.\d+)?\s*°?\s*$/.test(s)) {
    const v = parseFloat(s.replace("°", ""));
    if (letters && v < 0) return null;
    return sign * v;
  }
  const parts = s.split(/[°º'′’"″”\s]+/).filter((p) => p !== "");
  if (parts.length < 2 || parts.length > 3 || parts.some((p) => !/^\d+(\.\d+)?$/.test(p))) return null;
  const [d, m, sec] = [parseFloat(parts[0]), parseFloat(parts[1]), parseFloat(parts[2] || "0")];
  if (m >= 60 || sec >= 60) return null;
  return sign * (d + m / 60 + sec / 3600);
}

const $ = (id) => document.getElementById(id);

function query(withStart) {
  const lat = parseAngle($("lat").value, "N", "S");
  const lon = parseAngle($("lon").value, "E", "W");
  if (lat === null || lat < -90 || lat > 90) return { error: "Latitude: enter decimal degrees (−90 to 90) or degrees, minutes, seconds with N or S.", field: "lat" };
  if (lon === null || lon < -180 || lon > 180) return { error: "Longitude: enter decimal degrees (−180 to 180) or degrees, minutes, seconds with E or W.", field: "lon" };
  const p = new URLSearchParams();
  p.set("lat", lat.toFixed(4));
  p.set("lon", lon.toFixed(4));
  const kinds = [...document.querySelectorAll("input[name=kinds]:checked")].map((c) => c.value);
  if (kinds.length === 0 && $("lighting").value === "") return { error: "Choose at least one kind of event." };
  if (kinds.length) p.set("kinds", kinds.join(","));
  const num = (id) => $(id).value.trim();
  if (num("elev") !== "" && num("elev") !== "0") p.set("elev", num("elev"));
  const horizon = num("horizon").replace(/\s+/g, "");
  if (horizon !== "") p.set("horizon", horizon); // 0 too: a level horizon, without the dip of the elevation
  if ($("name").value.trim() !== "") p.set("name", $("name").value.trim());
  if ($("tz").value.trim() !== "") p.set("tz", $("tz").value.trim());
  if (num("alarm") !== "" && num("alarm") !== "0") p.set("alarm", num("alarm") + "m");
  if (num("lighting") !== "") p.set("lighting", hours(parseFloat(num("lighting"))));
  const offsets = [...document.querySelectorAll("input.offset")]
    .filter((o) => o.value.trim() !== "" && o.value.trim() !== "0" && kinds.includes(o.dataset.kind))
    .map((o) => o.dataset.kind + ":" + Math.round(parseFloat(o.value)) + "m");
  if (offsets.length) p.set("offsets", offsets.join(","));
  // until a date is chosen, the preview is from today at the place, which
  // the server takes when no start is given: the date the page came with
  // is the server's, a day off where the place's date is not (render); a
  // date the page's link gave (data-chosen) is chosen
  const start = $("start");
  if (withStart && start.value && (start.value !== start.defaultValue || "chosen" in start.dataset)) p.set("start", start.value);
  // the length of the table the share link opens, when the page's link
  // gave one (a table's "make another"): the preview is of seven days
  if ($("days").value) p.set("days", $("days").value);
  return { params: p };
}

// hours writes a number of hours, as the lighting input takes it, as a
// duration in the hours the input shows: 16 is "16h", 16.5 "16h30m", -0.5
// "-0h30m", so that a refused value is told back as it was given ("30h",
// not "1800m").
function hours(h) {
  if (h < 0) return "-" + hours(-h);
  const whole = Math.trunc(h);
  const min = Math.round((h - whole) * 60);
  return whole + "h" + (min ? min + "m" : "");
}

// The inputs whose server parameter has the same name: a refused query
// ("serve: parameter tz=…") is shown at its input as well.
const paramInputs = ["lat", "lon", "elev", "horizon", "name", "tz", "alarm", "lighting", "start"];

// show writes msg in the result (announced) and, when it is about an input
// that holds something, under that input too, which it marks invalid: on a
// phone the result is screens below the place.
function show(msg, field) {
  const m = $("message");
  m.textContent = msg;
  m.hidden = !msg;
  $("result").classList.toggle("stale", !!msg);
  const err = $("field-error");
  for (const el of document.querySelectorAll("[aria-invalid]")) {
    el.removeAttribute("aria-invalid");
    const ids = (el.getAttribute("aria-describedby") || "").split(" ").filter((id) => id && id !== "field-error");
    if (ids.length) el.setAttribute("aria-describedby", ids.join(" "));
    else el.removeAttribute("aria-describedby");
  }
  const input = msg && field ? $(field) : null;
  if (!input || input.value.trim() === "") {
    err.hidden = true;
    return;
  }
  input.setAttribute("aria-invalid", "true");
  input.setAttribute("aria-describedby", ((input.getAttribute("aria-describedby") || "") + " field-error").trim());
  err.textContent = msg;
  (input.closest(".grid") || input.closest(".field")).after(err);
  err.hidden = false;
}

function render(res) {
  $("result").classList.add("ready");
  $("webcal").href = res.webcal;
  $("https").value = res.https;
  $("page").href = res.page;
  $("qr").src = res.qr;
  $("tz-found").textContent = res.zone + (res.zone_found ? " (found from the coordinates)" : "");
  $("zone-note").textContent = "(times in " + res.zone + ")";
  // the days are those from the date chosen ("Preview from"), the next
  // ones or not
  // (fewer for a link's table of fewer days)
  const n = res.days.length;
  if (n) {
    // the date kept whole on one line, as the table's dates are
    const date = document.createElement("span");
    date.className = "date";
    date.textContent = res.days[0].date;
    $("days-h").replaceChildren((n === 7 ? "Seven days" : n === 1 ? "1 day" : n + " days") + " from " + res.days[0].weekday + " ", date);
  }
  // a date not chosen shows the first day previewed: today at the place
  const start = $("start");
  if (res.days.length && start.value === start.defaultValue) start.defaultValue = start.value = res.days[0].date;
  $("span-note").textContent = keepUnits(res.subscribe_note);
  const box = $("preview");
  box.textContent = "";
  const table = document.createElement("table");
  table.className = "days";
  const body = table.createTBody();
  for (const day of res.days) {
    const row = body.insertRow();
    const th = document.createElement("th");
    th.scope = "row";
    const date = document.createElement("span");
    date.className = "date";
    date.textContent = day.date;
    th.append(day.weekday + " ", date);
    row.appendChild(th);
    const td = row.insertCell();
    if (day.clocks) {
      // the times of the row shift with the clocks: say so first
      const p = document.createElement("p");
      p.className = "clocks";
      p.textContent = keepUnits(day.clocks);
      td.appendChild(p);
    }
    if (day.entries.length === 0) td.append("—");
    const ul = document.createElement("ul");
    for (const e of day.entries) {
      const li = document.createElement("li");
      li.dataset.kind = e.kind;
      if (e.time) {
        const t = document.createElement("span");
        t.className = "t";
        t.textContent = e.when || e.time + (e.end ? "–" + e.end : "");
        li.appendChild(t);
        li.appendChild(document.createTextNode(" "));
      }
      li.appendChild(document.createTextNode(keepUnits(e.title)));
      if (e.clocks) {
        // a change of the clocks during the span, as its description says
        const c = document.createElement("span");
        c.className = "during";
        c.textContent = keepUnits(e.clocks);
        li.append(" ", c);
      }
      ul.appendChild(li);
    }
    if (day.entries.length) td.appendChild(ul);
  }
  box.appendChild(table);
  // A screen reader hears that the preview changed, in one line, not the
  // whole table again after each key typed; the line is emptied first so
  // that the same words are announced again.
  const count = res.days.reduce((sum, day) => sum + day.entries.length, 0);
  const status = $("preview-status");
  status.textContent = "";
  setTimeout(() => {
    status.textContent = "Preview updated: " + $("days-h").textContent + ", " + count + (count === 1 ? " entry" : " entries") + ", times in " + res.zone + ".";
  }, 100);
}

// keepUnits joins a number and its unit ("16 h", "45 min", "+1 day"), the
// hours and minutes of one length ("9 h 05 min") and the day, month and
// year of a date ("2 Jul", "5 Dec 2026") with no-break spaces, as the
// server's publish.KeepUnits does for the page /at and the index page: a
// narrow screen breaks a line elsewhere. The JSON keeps its plain spaces.
const month = "(January|February|March|April|May|June|July|August|September|October|November|December|Jan|Feb|Mar|Apr|Jun|Jul|Aug|Sep|Oct|Nov|Dec)\\b";
function keepUnits(s) {
  return s.replace(/(\d) (h|min|s|days?|k?m)\b/g, "$1\u00a0$2").replace(/(\d\u00a0h) (\d+\u00a0min)/g, "$1\u00a0$2")
    .replace(new RegExp("(\\d) " + month, "g"), "$1\u00a0$2").replace(new RegExp("\\b" + month + " (\\d{4})\\b", "g"), "$1\u00a0$2");
}

let timer = 0;
let seq = 0;
function update() {
  clearTimeout(timer);
  timer = setTimeout(async () => {
    const q = query(true);
    if (q.error) {
      if ($("lat").value || $("lon").value) show(q.error, q.field);
      return;
    }
    const mine = ++seq;
    try {
      // relative: a proxy may serve the page under a path of its site
      const r = await fetch("at.json?" + q.params.toString());
      const text = await r.text();
      if (mine !== seq) return;
      if (!r.ok) {
        const named = text.match(/^serve: parameter (\w+)=/);
        show(text.trim().replace(/^serve: /, ""), named && paramInputs.includes(named[1]) ? named[1] : "");
        return;
      }
      show("");
      render(JSON.parse(text));
      document.body.dataset.previewed = String(mine);
    } catch (err) {
      if (mine === seq) show("The server could not be reached: " + err.message);
    }
  }, 250);
}

function locate() {
  const status = $("locate-status");
  if (!navigator.geolocation) {
    status.textContent = "This browser cannot tell its location.";
    return;
  }
  status.textContent = "Asking the browser for your location…";
  navigator.geolocation.getCurrentPosition(
    (pos) => {
      $("lat").value = pos.coords.latitude.toFixed(4);
      $("lon").value = pos.coords.longitude.toFixed(4);
      if (pos.coords.altitude != null) $("elev").value = Math.round(pos.coords.altitude);
      status.textContent = "Location filled in.";
      update();
    },
    (err) => { status.textContent = "No location: " + err.message; },
    { enableHighAccuracy: false, timeout: 15000 }
  );
}

async function copy() {
  const field = $("https");
  let ok = false;
  try {
    await navigator.clipboard.writeText(field.value);
    ok = true;
  } catch (_) {
    field.select();
    ok = document.execCommand && document.execCommand("copy");
  }
  $("copy-status").textContent = ok ? "Copied." : "Select the address and copy it.";
}

document.addEventListener("DOMContentLoaded", () => {
  const form = $("builder");
  if (!form) return;
  form.addEventListener("input", update);
  form.addEventListener("change", update);
  form.addEventListener("submit", (e) => { e.preventDefault(); update(); });
  $("locate").addEventListener("click", locate);
  $("copy").addEventListener("click", copy);
  update();
});
