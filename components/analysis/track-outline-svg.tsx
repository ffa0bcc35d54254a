/**
 * A small track outline as SVG (local metres, north up) with numbered marks. Plain markup, so it
 * renders on the server and inside client components alike; no map tiles are needed.
 */
export interface OutlineMark {
  key: string | number;
  x: number;
  y: number;
  label: string;
  tone: "alert" | "signal" | "trace" | "ok" | "ink";
  title?: string;
  active?: boolean;
}

const TONE: Record<OutlineMark["tone"], string> = {
  alert: "var(--color-alert-400)",
  signal: "var(--color-signal-400)",
  trace: "var(--color-trace-400)",
  ok: "var(--color-ok-400)",
  ink: "var(--color-ink-300)",
};

export function TrackOutlineSvg({ points, marks = [], label, className = "" }: { points: [number, number][]; marks?: OutlineMark[]; label: string; className?: string }) {
  if (points.length < 2) return null;
  let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
  for (const [x, y] of points) {
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
  }
  const span = Math.max(maxX - minX, maxY - minY, 1);
  const pad = span * 0.06;
  const r = span * 0.018;
  // SVG y grows downwards; north is up, so y is flipped.
  const d = points.map(([x, y], i) => `${i ? "L" : "M"}${(x - minX).toFixed(1)} ${(maxY - y).toFixed(1)}`).join("");
  return (
    <svg viewBox={`${-pad} ${-pad} ${maxX - minX + 2 * pad} ${maxY - minY + 2 * pad}`} role="img" aria-label={label} className={`h-auto w-full ${className}`}>
      <path d={d} fill="none" stroke="var(--color-ink-600)" strokeWidth={span * 0.012} strokeLinejoin="round" strokeLinecap="round" />
      <path d={d} fill="none" stroke="var(--color-ink-400)" strokeWidth={span * 0.003} strokeLinejoin="round" />
      {marks.map((m) => (
        <g key={m.key} transform={`translate(${(m.x - minX).toFixed(1)} ${(maxY - m.y).toFixed(1)})`}>
          {m.title ? <title>{m.title}</title> : null}
          <circle r={m.active ? r * 1.35 : r} fill={TONE[m.tone]} stroke="var(--color-ink-950)" strokeWidth={r * 0.25} />
          <text textAnchor="middle" dominantBaseline="central" fontSize={r * 1.1} fontWeight={700} fill="var(--color-ink-950)">
            {m.label}
          </text>
        </g>
      ))}
    </svg>
  );
}
