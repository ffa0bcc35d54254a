/** Slip against throttle as an SVG scatter (the points are already thinned on the server). */
export function SlipScatterSvg({ throttlePct, slip, targetSlip }: { throttlePct: number[]; slip: number[]; targetSlip: number }) {
  const W = 420, H = 260, L = 44, B = 30, T = 10, R = 10;
  const yMin = -5, yMax = 20;
  const x = (t: number) => L + (Math.min(100, Math.max(0, t)) / 100) * (W - L - R);
  const y = (s: number) => T + (1 - (Math.min(yMax, Math.max(yMin, s * 100)) - yMin) / (yMax - yMin)) * (H - T - B);
  return (
    <svg viewBox={`0 0 ${W} ${H}`} className="h-auto w-full" role="img" aria-label="Drive slip against throttle">
      {[0, 25, 50, 75, 100].map((t) => (
        <g key={t}>
          <line x1={x(t)} x2={x(t)} y1={T} y2={H - B} stroke="var(--color-ink-700)" />
          <text x={x(t)} y={H - B + 14} textAnchor="middle" fontSize={10} fill="var(--color-ink-400)">{t}</text>
        </g>
      ))}
      {[-5, 0, 5, 10, 15, 20].map((s) => (
        <g key={s}>
          <line x1={L} x2={W - R} y1={y(s / 100)} y2={y(s / 100)} stroke="var(--color-ink-700)" />
          <text x={L - 6} y={y(s / 100) + 3} textAnchor="end" fontSize={10} fill="var(--color-ink-400)">{s}</text>
        </g>
      ))}
      <line x1={L} x2={W - R} y1={y(targetSlip)} y2={y(targetSlip)} stroke="var(--color-alert-400)" strokeDasharray="6 4" />
      {throttlePct.map((t, i) => (
        <circle key={i} cx={x(t).toFixed(1)} cy={y(slip[i]!).toFixed(1)} r={1.4} fill="var(--color-signal-400)" fillOpacity={0.35} />
      ))}
      <text x={(L + W - R) / 2} y={H - 2} textAnchor="middle" fontSize={11} fill="var(--color-ink-300)">Throttle (%)</text>
      <text x={12} y={(T + H - B) / 2} textAnchor="middle" fontSize={11} fill="var(--color-ink-300)" transform={`rotate(-90 12 ${(T + H - B) / 2})`}>Drive slip (%)</text>
    </svg>
  );
}
