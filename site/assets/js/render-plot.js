// Plots: series as polylines on round ticks, markers numbered and listed below.
// A plot is drawn as a plan (render-patch): made into elements once, then brought
// up to each new drawing attribute by attribute.

import { finite } from "./dom.js";
import { htmlPlan, svgPlan } from "./render-patch.js";

/** Round tick values spanning [lo, hi]: steps of 1, 2 or 5 times a power of ten. */
function ticks(lo, hi, count) {
  if (!(hi > lo)) return { lo: lo - 1, hi: hi + 1, values: [lo] };
  const raw = (hi - lo) / Math.max(1, count);
  const power = Math.pow(10, Math.floor(Math.log10(raw)));
  const step = [1, 2, 5, 10].map((m) => m * power).find((s) => s >= raw) || raw;
  const start = Math.floor(lo / step) * step;
  const end = Math.ceil(hi / step) * step;
  const values = [];
  for (let v = start; v <= end + step * 1e-9 && values.length < 50; v += step) values.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return { lo: start, hi: end, values, step };
}

function tickText(value, step) {
  const decimals = Math.max(0, Math.min(6, -Math.floor(Math.log10(step || 1) + 1e-9)));
  const abs = Math.abs(value);
  if (abs !== 0 && (abs >= 1e6 || abs < 1e-4)) return value.toExponential(1);
  return value.toFixed(decimals);
}

/** The plan of a plot's figure (`create` / `patch` in render-patch make it). */
export function planPlot(plot, width) {
  const points = [];
  for (const series of plot.series || []) for (const p of series.points || []) if (finite(p[0], p[1])) points.push(p);
  for (const marker of plot.markers || []) if (finite(marker.at?.[0], marker.at?.[1])) points.push(marker.at);
  const figure = htmlPlan("figure", { class: "panel figure plot", dataset: { plot: plot.key || "" } });
  if (plot.title) figure.append(htmlPlan("h2", { class: "panel-title", text: plot.title }));
  if (points.length === 0) {
    figure.append(htmlPlan("p", { text: "Nothing to plot for these inputs." }));
    return figure;
  }
  const W = Math.max(280, width);
  const H = Math.round(Math.min(360, Math.max(220, W * 0.62)));
  const pad = { left: 58, right: 14, top: 12, bottom: 44 };
  const xs = points.map((p) => p[0]);
  const ys = points.map((p) => p[1]);
  const tx = ticks(Math.min(...xs), Math.max(...xs), W < 420 ? 4 : 6);
  const ty = ticks(Math.min(0, Math.min(...ys)), Math.max(...ys), 5);
  const sx = (x) => pad.left + ((x - tx.lo) / (tx.hi - tx.lo)) * (W - pad.left - pad.right);
  const sy = (y) => H - pad.bottom - ((y - ty.lo) / (ty.hi - ty.lo)) * (H - pad.top - pad.bottom);

  const root = svgPlan("svg", { class: "plot-svg", viewBox: `0 0 ${W} ${H}`, width: W, height: H, role: "img", "aria-label": plot.title || "Plot" });
  const grid = svgPlan("g", { class: "plot-grid" });
  for (const v of tx.values) {
    grid.append(svgPlan("line", { x1: sx(v), y1: pad.top, x2: sx(v), y2: H - pad.bottom }));
    root.append(svgPlan("text", { class: "tick", x: sx(v), y: H - pad.bottom + 16, "text-anchor": "middle", text: tickText(v, tx.step) }));
  }
  for (const v of ty.values) {
    grid.append(svgPlan("line", { x1: pad.left, y1: sy(v), x2: W - pad.right, y2: sy(v) }));
    root.append(svgPlan("text", { class: "tick", x: pad.left - 6, y: sy(v), "text-anchor": "end", "dominant-baseline": "central", text: tickText(v, ty.step) }));
  }
  root.prepend(grid);
  root.append(
    svgPlan("line", { class: "axis", x1: pad.left, y1: H - pad.bottom, x2: W - pad.right, y2: H - pad.bottom }),
    svgPlan("line", { class: "axis", x1: pad.left, y1: pad.top, x2: pad.left, y2: H - pad.bottom }),
    svgPlan("text", { class: "axis-label", x: (pad.left + W - pad.right) / 2, y: H - 6, "text-anchor": "middle", text: plot.x_label || "" }),
    svgPlan("text", {
      class: "axis-label",
      x: 0,
      y: 0,
      transform: `translate(14 ${(pad.top + H - pad.bottom) / 2}) rotate(-90)`,
      "text-anchor": "middle",
      text: plot.y_label || "",
    }),
  );
  const legend = htmlPlan("ul", { class: "legend" });
  (plot.series || []).forEach((series, index) => {
    const pts = (series.points || []).filter((p) => finite(p[0], p[1]));
    if (pts.length === 0) return;
    root.append(svgPlan("polyline", { class: `series series-${index % 4}`, points: pts.map((p) => `${sx(p[0])},${sy(p[1])}`).join(" ") }));
    const swatch = svgPlan("svg", { class: "swatch", viewBox: "0 0 36 12", width: 36, height: 12, "aria-hidden": "true" });
    swatch.append(svgPlan("line", { class: `series series-${index % 4}`, x1: 1, y1: 6, x2: 35, y2: 6 }));
    legend.append(htmlPlan("li", {}, swatch, htmlPlan("span", { text: series.name || `Series ${index + 1}` })));
  });
  // Markers are numbered on the plot and named in a list below it: long labels
  // of nearby points would collide on a phone.
  const markerList = htmlPlan("ol", { class: "plot-markers" });
  let number = 0;
  for (const marker of plot.markers || []) {
    if (!finite(marker.at?.[0], marker.at?.[1])) continue;
    number += 1;
    const x = sx(marker.at[0]);
    const y = sy(marker.at[1]);
    const right = x < W * 0.75;
    const below = number % 2 === 0;
    root.append(
      svgPlan("circle", { class: "marker", cx: x, cy: y, r: 5 }),
      svgPlan("text", {
        class: "marker-label",
        x: right ? x + 8 : x - 8,
        y: below ? y + 15 : y - 8,
        "text-anchor": right ? "start" : "end",
        text: String(number),
      }),
    );
    markerList.append(htmlPlan("li", { text: marker.label || `Point ${number}` }));
  }
  figure.append(htmlPlan("div", { class: "figure-canvas" }, root));
  if (legend.childElementCount > 0) figure.append(legend);
  if (markerList.childElementCount > 0) figure.append(markerList);
  return figure;
}

