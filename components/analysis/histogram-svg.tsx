/** A histogram as SVG bars: `edges` has one more entry than `values`; values are % of time. */
export function HistogramSvg({ edges, values, label, unit, split, tickEvery }: { edges: number[]; values: number[]; label: string; unit: string; split?: number[]; tickEvery: number }) {
  const W = 420, H = 200, L = 36, B = 30, T = 8, R = 8;
  const lo = edges[0] ?? NaN;
  const hi = edges[edges.length - 1] ?? NaN;
  const vmax = Math.max(1, ...values);
  const x = (v: number) => L + ((v - lo) / (hi - lo)) * (W - L - R);
  const y = (p: number) => T + (1 - p / vmax) * (H - T - B);
  const ticks: number[] = [];
  for (let t = Math.ceil(lo / tickEvery) * tickEvery; t <= hi + 1e-9; t += tickEvery) ticks.push(Math.round(t * 1000) / 1000);
  return (
    <svg viewBox={`0 0 ${W} ${H}`} className="h-auto w-full" role="img" aria-label={label}>
      <line x1={L} x2={W - R} y1={H - B} y2={H - B} stroke="var(--color-ink-600)" />
      {values.map((v, i) => (
        <rect key={i} x={x(edges[i]!) + 0.5} width={Math.max(0.5, x(edges[i + 1]!) - x(edges[i]!) - 1)} y={y(v)} height={H - B - y(v)} fill="var(--color-trace-500)">
          <title>{`${edges[i]}–${edges[i + 1]} ${unit}: ${v.toFixed(1)} % of time`}</title>
        </rect>
      ))}
      {(split ?? []).map((s) => (
        <line key={s} x1={x(s)} x2={x(s)} y1={T} y2={H - B} stroke="var(--color-signal-400)" strokeDasharray="4 3" />
      ))}
      {ticks.map((t) => (
        <text key={t} x={x(t)} y={H - B + 13} textAnchor="middle" fontSize={10} fill="var(--color-ink-400)">{t}</text>
      ))}
      <text x={L - 4} y={T + 8} textAnchor="end" fontSize={10} fill="var(--color-ink-400)">{vmax.toFixed(0)}%</text>
      <text x={(L + W - R) / 2} y={H - 3} textAnchor="middle" fontSize={11} fill="var(--color-ink-300)">{unit}</text>
    </svg>
  );
}
