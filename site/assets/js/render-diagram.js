// Diagrams: model coordinates in metres, y up; SVG y down, so y is negated. Each
// shape's style is a class (`s-restraint`); its colours are custom properties in
// the stylesheet. A diagram is drawn as a plan (render-patch): made into elements
// once, then brought up to each new drawing attribute by attribute.

import { finite } from "./dom.js";
import { htmlPlan, svgPlan } from "./render-patch.js";
import { state } from "./state.js";

/** Plain names of the shape styles, for diagram legends. */
const STYLE_NAMES = {
  restraint: "Restraint: force the supports exert on the fitting",
  thrust: "Thrust: force the fluid exerts on the fitting",
  pressure: "Pressure force (gauge)",
  momentum: "Momentum flux",
  weight: "Weight",
  velocity: "Velocity",
  flow: "Flow direction",
  control_volume: "Control volume",
  wall: "Pipe or body",
  fluid: "Fluid",
  guide: "Guide line",
};

/** Breaks text at spaces into lines of at most `max` characters (longer words stay whole). */
function wrapWords(text, max) {
  const lines = [];
  let line = "";
  for (const word of String(text).split(/\s+/).filter(Boolean)) {
    if (line && Array.from(line).length + 1 + Array.from(word).length > max) {
      lines.push(line);
      line = word;
    } else {
      line = line ? `${line} ${word}` : word;
    }
  }
  if (line) lines.push(line);
  // A lone "=" or unit letter joins the line before it.
  if (lines.length > 1 && Array.from(lines[lines.length - 1]).length <= 2) {
    const last = lines.pop();
    lines.push(`${lines.pop()} ${last}`);
  }
  return lines.length > 0 ? lines : [String(text)];
}

/** Screen size of diagram labels, in CSS pixels. */
const LABEL_PX = 13;

/**
 * How far a label that overlaps another looks for a free place, in 5 px steps:
 * along its arrow, to either side, and up or down for plain text.
 */
const ALONG_STEPS = 16;
const SIDE_STEPS = 8;
const PLAIN_STEPS = 24;

/**
 * Where a label sits relative to its point: text anchor, baseline, and its box in
 * screen pixels (x right, y down), estimated from its length.
 */
function labelLayout(label) {
  let anchor = "middle";
  let baseline = "central";
  if (!label.plain) {
    if (label.ux > 0.3) anchor = "start";
    else if (label.ux < -0.3) anchor = "end";
    if (Math.abs(label.uy) > Math.abs(label.ux)) baseline = label.uy > 0 ? "auto" : "hanging";
  }
  const w = Math.max(...label.lines.map((line) => Array.from(line).length)) * LABEL_PX * 0.64;
  const h = LABEL_PX * 1.2 * label.lines.length + LABEL_PX * 0.05;
  const x0 = anchor === "start" ? 0 : anchor === "end" ? -w : -w / 2;
  const y0 = baseline === "auto" ? -h * 0.85 : baseline === "hanging" ? 0 : -h / 2;
  return { anchor, baseline, box: [x0, y0, x0 + w, y0 + h] };
}

/** The plan of a diagram's figure (`create` / `patch` in render-patch make it). */
export function planDiagram(diagram, index, width) {
  let [minX, minY, maxX, maxY] = diagram.bounds || [0, 0, 1, 1];
  if (!finite(minX, minY, maxX, maxY) || maxX <= minX || maxY <= minY) [minX, minY, maxX, maxY] = [0, 0, 1, 1];
  const centre = [(minX + maxX) / 2, (minY + maxY) / 2];
  const styles = new Set();
  const arrowStyles = new Set();
  const geometry = [];
  const labels = [];

  for (const shape of diagram.shapes || []) {
    const style = String(shape.style || "label");
    switch (shape.type) {
      case "polygon":
      case "polyline": {
        const points = (shape.points || []).filter((p) => Array.isArray(p) && finite(p[0], p[1]));
        if (points.length < 2) break;
        geometry.push({ tag: shape.type, style, points });
        styles.add(style);
        break;
      }
      case "circle": {
        const c = shape.center || [];
        if (!finite(c[0], c[1], shape.radius)) break;
        geometry.push({ tag: "circle", style, c, r: Math.abs(shape.radius) });
        styles.add(style);
        break;
      }
      case "arrow": {
        const a = shape.from || [];
        const b = shape.to || [];
        if (!finite(a[0], a[1], b[0], b[1])) break;
        geometry.push({ tag: "arrow", style, a, b });
        arrowStyles.add(style);
        styles.add(style);
        if (shape.label) {
          // Label the end farther from the middle of the drawing, just beyond it,
          // so labels of arrows meeting at the fitting do not pile up.
          const far = (p) => Math.hypot(p[0] - centre[0], p[1] - centre[1]);
          const atTip = far(b) >= far(a);
          const at = atTip ? b : a;
          const other = atTip ? a : b;
          const length = Math.hypot(at[0] - other[0], at[1] - other[1]) || 1;
          labels.push({
            at,
            ux: (at[0] - other[0]) / length,
            uy: (at[1] - other[1]) / length,
            text: String(shape.label),
            name: String(shape.name || ""),
            value: String(shape.value || ""),
            style,
          });
        }
        break;
      }
      case "text": {
        const at = shape.at || [];
        if (!finite(at[0], at[1]) || !shape.text) break;
        labels.push({
          at,
          ux: 0,
          uy: 0,
          text: String(shape.text),
          name: String(shape.name || ""),
          value: String(shape.value || ""),
          style,
          plain: true,
        });
        break;
      }
      default:
        break;
    }
  }
  // On narrow screens a label puts its value (split off by the adapter) on a
  // line of its own, and long text is wrapped at spaces, so that labels do not
  // shrink the drawing.
  const narrow = width < 480;
  const maxChars = narrow ? 16 : 30;
  for (const label of labels) {
    label.lines =
      narrow && label.name && label.value ? [...wrapWords(label.name, maxChars), label.value] : wrapWords(label.text, maxChars);
    Object.assign(label, labelLayout(label));
  }

  // Fit the drawing and its labels: the scale depends on the view, and the labels'
  // extent in model units on the scale, so settle both in a few rounds.
  const pad = 0.04 * Math.max(maxX - minX, maxY - minY);
  const maxH = Math.max(260, Math.min(560, state.viewportHeight * 0.7));
  let view = [minX - pad, minY - pad, maxX + pad, maxY + pad];
  let scale = 1;
  // Force labels are placed first; a label that would overlap one already placed
  // moves outward along its arrow (plain text moves down) until it is clear.
  const priority = (label) => (label.style === "restraint" || label.style === "thrust" ? 0 : label.plain ? 2 : 1);
  labels.sort((a, b) => priority(a) - priority(b));
  const overlaps = (a, b) => a[0] < b[2] && b[0] < a[2] && a[1] < b[3] && b[1] < a[3];
  const fit = (v) => Math.min(width / (v[2] - v[0]), maxH / (v[3] - v[1]));
  /** Places every label at `scale` and returns the view that holds them all. */
  const place = (scale) => {
    const next = [minX - pad, minY - pad, maxX + pad, maxY + pad];
    const placed = [];
    for (const label of labels) {
      const gap = label.plain ? 0 : 6 / scale;
      let x = label.at[0] + label.ux * gap;
      let y = label.at[1] + label.uy * gap;
      const [bx0, by0, bx1, by1] = label.box;
      // Screen box (px, y down) of the label at model point (x, y), 2 px clear.
      const screen = () => [x * scale + bx0 - 2, -y * scale + by0 - 2, x * scale + bx1 + 2, -y * scale + by1 + 2];
      const [mx, my] = label.plain || (label.ux === 0 && label.uy === 0) ? [0, -1] : [label.ux, label.uy];
      // Try further out along the arrow (up to 80 px; plain text: down, or up, up
      // to 120 px), or to either side (up to 40 px), 5 px a step, nearest first; a
      // label that finds no free place stays where it belongs rather than wander
      // away from what it names.
      const start = [x, y];
      const tries = [[0, 0]];
      const along = label.plain ? PLAIN_STEPS : ALONG_STEPS;
      for (let k = 1; k <= along; k += 1) {
        tries.push([mx * k, my * k]);
        if (k <= SIDE_STEPS) tries.push([-my * k, mx * k], [my * k, -mx * k]);
        if (label.plain) tries.push([-mx * k, -my * k]);
      }
      let free = false;
      for (const [tx, ty] of tries) {
        x = start[0] + (tx * 5) / scale;
        y = start[1] + (ty * 5) / scale;
        if (!placed.some((box) => overlaps(box, screen()))) {
          free = true;
          break;
        }
      }
      if (!free) [x, y] = start;
      placed.push(screen());
      label.x = x;
      label.y = y;
      next[0] = Math.min(next[0], x + bx0 / scale - 3 / scale);
      next[2] = Math.max(next[2], x + bx1 / scale + 3 / scale);
      next[1] = Math.min(next[1], y - by1 / scale - 3 / scale);
      next[3] = Math.max(next[3], y - by0 / scale + 3 / scale);
    }
    return next;
  };
  // The view only grows, so the scale only shrinks and this settles; it stops when
  // the labels placed at the scale drawn fit inside the view.
  const eps = 1e-9 * Math.max(maxX - minX, maxY - minY);
  for (let round = 0; round < 12; round += 1) {
    scale = fit(view);
    const next = place(scale);
    if (next[0] >= view[0] - eps && next[1] >= view[1] - eps && next[2] <= view[2] + eps && next[3] <= view[3] + eps) break;
    view = [Math.min(view[0], next[0]), Math.min(view[1], next[1]), Math.max(view[2], next[2]), Math.max(view[3], next[3])];
  }
  const px = (n) => n / scale; // screen px -> model units
  const vbW = view[2] - view[0];
  const vbH = view[3] - view[1];
  const prefix = `d${index}`;
  const markerFor = (style) => `${prefix}-head-${style}`;

  const root = svgPlan("svg", {
    class: "diagram",
    viewBox: `${view[0]} ${-view[3]} ${vbW} ${vbH}`,
    width: Math.round(vbW * scale),
    height: Math.round(vbH * scale),
    role: "img",
    "aria-label": diagram.title || "Diagram",
    "font-size": px(LABEL_PX),
  });
  const defs = svgPlan("defs");
  root.append(defs);
  for (const style of arrowStyles) {
    const size = px(style === "restraint" || style === "thrust" ? 12 : 10);
    defs.append(
      svgPlan(
        "marker",
        {
          id: markerFor(style),
          class: `head s-${style}`,
          viewBox: "0 0 10 10",
          refX: 9,
          refY: 5,
          markerWidth: size,
          markerHeight: size,
          markerUnits: "userSpaceOnUse",
          orient: "auto-start-reverse",
        },
        svgPlan("path", { d: "M0,0 L10,5 L0,10 z" }),
      ),
    );
  }
  // Model y is up, SVG y is down: every y is negated.
  for (const item of geometry) {
    const cls = `shape s-${item.style}`;
    if (item.tag === "circle") {
      root.append(svgPlan("circle", { class: cls, cx: item.c[0], cy: -item.c[1], r: item.r, "vector-effect": "non-scaling-stroke" }));
    } else if (item.tag === "arrow") {
      root.append(
        svgPlan("line", {
          class: `${cls} arrow`,
          x1: item.a[0],
          y1: -item.a[1],
          x2: item.b[0],
          y2: -item.b[1],
          "vector-effect": "non-scaling-stroke",
          "marker-end": `url(#${markerFor(item.style)})`,
        }),
      );
    } else {
      root.append(
        svgPlan(item.tag, {
          class: cls,
          points: item.points.map((p) => `${p[0]},${-p[1]}`).join(" "),
          "vector-effect": "non-scaling-stroke",
        }),
      );
    }
  }
  // Labels last, so they sit on top of the lines.
  const lineStep = px(LABEL_PX * 1.2);
  for (const label of labels) {
    const text = svgPlan("text", {
      class: `label s-${label.style}`,
      x: label.x,
      y: -label.y,
      "text-anchor": label.anchor,
      "dominant-baseline": label.baseline,
      // The halo behind the text, 3 screen px (in model units: the lines of a
      // label inherit it, and non-scaling strokes do not reach them).
      "stroke-width": px(3),
    });
    const n = label.lines.length;
    const first = label.baseline === "auto" ? -(n - 1) * lineStep : label.baseline === "hanging" ? 0 : (-(n - 1) * lineStep) / 2;
    label.lines.forEach((line, i) => {
      text.append(svgPlan("tspan", { x: label.x, dy: i === 0 ? first : lineStep, text: line }));
    });
    root.append(text);
  }

  const figure = htmlPlan("figure", { class: "panel figure" });
  if (diagram.title) figure.append(htmlPlan("h2", { class: "panel-title", text: diagram.title }));
  figure.append(htmlPlan("div", { class: "figure-canvas" }, root));
  const legend = renderLegend(styles);
  if (legend) figure.append(legend);
  if (diagram.caption) figure.append(htmlPlan("figcaption", { text: diagram.caption }));
  return figure;
}

function renderLegend(styles) {
  const order = ["restraint", "thrust", "pressure", "momentum", "weight", "velocity", "flow", "control_volume", "wall", "fluid"];
  const shown = order.filter((style) => styles.has(style));
  if (shown.length === 0) return null;
  const list = htmlPlan("ul", { class: "legend" });
  for (const style of shown) {
    const isArrow = ["restraint", "thrust", "pressure", "momentum", "weight", "velocity", "flow"].includes(style);
    const swatch = svgPlan("svg", { class: "swatch", viewBox: "0 0 36 12", width: 36, height: 12, "aria-hidden": "true" });
    if (isArrow) {
      swatch.append(
        svgPlan("line", { class: `shape s-${style} arrow`, x1: 1, y1: 6, x2: 28, y2: 6 }),
        svgPlan("path", { class: `head s-${style}`, d: "M26,1 L35,6 L26,11 z" }),
      );
    } else {
      swatch.append(svgPlan("rect", { class: `shape s-${style}`, x: 2, y: 1, width: 32, height: 10 }));
    }
    list.append(htmlPlan("li", {}, swatch, htmlPlan("span", { text: STYLE_NAMES[style] || style })));
  }
  return list;
}

