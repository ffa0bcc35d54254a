"use client";
/**
 * The reference lap's path (local metres east/north from lib/geo toLocalMetres, computed on the
 * server) drawn on a canvas, coloured by a chosen channel, with the synced cursor's position.
 * The outline is drawn once per data/colour change; the cursor on its own layer.
 */
import { useEffect, useMemo, useRef } from "react";
import { interpolateAt } from "./series-lookup";
import { rampColour } from "./lap-colours";

/** Even pace in graphite; time gained shades towards teal, time lost towards amber. */
function gainColour(v: number, maxAbs: number): string {
  const f = Math.min(1, Math.abs(v) / Math.max(1e-12, maxAbs));
  const to = v < 0 ? [79, 209, 197] : [245, 158, 27];
  const from = [58, 68, 80];
  const c = from.map((a, k) => Math.round(a + (to[k] - a) * f));
  return `rgb(${c[0]},${c[1]},${c[2]})`;
}

export interface TrackMapProps {
  /** x of each point (SI: m or s), ascending. */
  x: ArrayLike<number>;
  eastM: ArrayLike<number>;
  northM: ArrayLike<number>;
  /** Colouring channel at each point (display units), or null for a plain outline. */
  values: ArrayLike<number> | null;
  valueLabel: string;
  cursorX: number | null;
  /** Values are time lost (+) or gained (−) per point: a diverging scale around even. */
  diverging?: boolean;
  size?: number;
  /** Corner apexes to number on the outline (x in the same units as `x`). */
  corners?: { x: number; name: string }[];
}

const DEFAULT_SIZE = 300;
const PAD = 14;

export function TrackMap({ x, eastM, northM, values, valueLabel, cursorX, diverging = false, size: SIZE = DEFAULT_SIZE, corners = [] }: TrackMapProps) {
  const base = useRef<HTMLCanvasElement>(null);
  const top = useRef<HTMLCanvasElement>(null);
  const fit = useRef<{ s: number; ox: number; oy: number } | null>(null);
  const range = useMemo<[number, number] | null>(() => {
    let lo = Infinity;
    let hi = -Infinity;
    if (values) for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) { lo = Math.min(lo, values[i]); hi = Math.max(hi, values[i]); }
    if (!Number.isFinite(lo)) return null;
    if (diverging) {
      const m = Math.max(Math.abs(lo), Math.abs(hi));
      return [-m, m];
    }
    return [lo, hi];
  }, [values, diverging]);

  useEffect(() => {
    const cv = base.current!;
    const dpr = window.devicePixelRatio || 1;
    cv.width = SIZE * dpr;
    cv.height = SIZE * dpr;
    const c = cv.getContext("2d")!;
    c.setTransform(dpr, 0, 0, dpr, 0, 0);
    c.clearRect(0, 0, SIZE, SIZE);
    let minE = Infinity, maxE = -Infinity, minN = Infinity, maxN = -Infinity;
    for (let i = 0; i < eastM.length; i++) {
      const e = eastM[i], n = northM[i];
      if (!Number.isFinite(e) || !Number.isFinite(n)) continue;
      if (e < minE) minE = e; if (e > maxE) maxE = e;
      if (n < minN) minN = n; if (n > maxN) maxN = n;
    }
    if (!Number.isFinite(minE)) return;
    const s = Math.min((SIZE - 2 * PAD) / Math.max(1, maxE - minE), (SIZE - 2 * PAD) / Math.max(1, maxN - minN));
    const ox = (SIZE - s * (maxE - minE)) / 2 - s * minE;
    const oy = (SIZE + s * (maxN - minN)) / 2 + s * minN; // north up
    fit.current = { s, ox, oy };
    c.lineWidth = 4;
    c.lineCap = "round";
    for (let i = 1; i < eastM.length; i++) {
      const e0 = eastM[i - 1], n0 = northM[i - 1], e1 = eastM[i], n1 = northM[i];
      if (![e0, n0, e1, n1].every(Number.isFinite)) continue;
      const v = values ? values[i] : NaN;
      c.strokeStyle = range && Number.isFinite(v) ? (diverging ? gainColour(v, range[1]) : rampColour((v - range[0]) / Math.max(1e-9, range[1] - range[0]))) : "#7d8896";
      c.beginPath();
      c.moveTo(ox + s * e0, oy - s * n0);
      c.lineTo(ox + s * e1, oy - s * n1);
      c.stroke();
    }
    // Start/finish: the path's first point.
    c.fillStyle = "#e4e8ed";
    c.fillRect(ox + s * eastM[0] - 2, oy - s * northM[0] - 6, 4, 12);
    // Corners numbered beside the outline, in lap order.
    c.font = "10px sans-serif";
    c.fillStyle = "#a3adb9";
    corners.forEach((k, i) => {
      const e = interpolateAt(x, eastM, k.x);
      const n = interpolateAt(x, northM, k.x);
      if (Number.isFinite(e) && Number.isFinite(n)) c.fillText(String(i + 1), ox + s * e + 5, oy - s * n - 5);
    });
  }, [eastM, northM, values, range, diverging, SIZE, corners, x]);

  useEffect(() => {
    const cv = top.current!;
    const dpr = window.devicePixelRatio || 1;
    // Both dimensions: a canvas starts at 300 × 150, so a width check alone can miss the height.
    if (cv.width !== SIZE * dpr || cv.height !== SIZE * dpr) {
      cv.width = SIZE * dpr;
      cv.height = SIZE * dpr;
    }
    const c = cv.getContext("2d")!;
    c.setTransform(dpr, 0, 0, dpr, 0, 0);
    c.clearRect(0, 0, SIZE, SIZE);
    const f = fit.current;
    if (!f || cursorX == null) return;
    const e = interpolateAt(x, eastM, cursorX);
    const n = interpolateAt(x, northM, cursorX);
    if (!Number.isFinite(e) || !Number.isFinite(n)) return;
    c.beginPath();
    c.arc(f.ox + f.s * e, f.oy - f.s * n, 6, 0, 2 * Math.PI);
    c.fillStyle = "#0d1014";
    c.fill();
    c.lineWidth = 3;
    c.strokeStyle = "#e4e8ed";
    c.stroke();
  }, [cursorX, x, eastM, northM, SIZE]);

  const r = range;
  return (
    <figure className="space-y-2" data-testid="track-map">
      <div className="relative mx-auto" style={{ width: SIZE, height: SIZE }}>
        <canvas ref={base} role="img" aria-label={`Track outline of the reference lap${values ? `, coloured by ${valueLabel}` : ""}`} style={{ width: SIZE, height: SIZE }} className="absolute inset-0" />
        <canvas ref={top} aria-hidden style={{ width: SIZE, height: SIZE }} className="absolute inset-0" />
      </div>
      {values && diverging && (
        <figcaption className="flex items-center gap-2 text-[11px] text-ink-400" data-testid="outline-legend">
          <span>gained</span>
          <span className="h-2 flex-1 rounded" style={{ background: `linear-gradient(90deg, ${gainColour(-1, 1)}, ${gainColour(0, 1)}, ${gainColour(1, 1)})` }} />
          <span>lost</span>
          <span className="text-ink-300">{valueLabel}</span>
        </figcaption>
      )}
      {values && !diverging && (
        <figcaption className="flex items-center gap-2 text-[11px] text-ink-400" data-testid="outline-legend">
          <span className="num">{r ? r[0].toFixed(0) : ""}</span>
          <span className="h-2 flex-1 rounded" style={{ background: `linear-gradient(90deg, ${[0, 1 / 2, 1].map((f) => rampColour(f)).join(",")})` }} />
          <span className="num">{r ? r[1].toFixed(0) : ""}</span>
          <span>{valueLabel}</span>
        </figcaption>
      )}
    </figure>
  );
}
