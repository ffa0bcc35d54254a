export interface SlipThrottleScatter {
  throttlePct: Float32Array;
  slip: Float32Array;
}

/**
 * Points for the slip-against-throttle scatter: pairs where both values are finite, thinned by
 * an even stride to at most `maxPoints` (a chart cannot show more points than pixels anyway).
 */
export function slipThrottleScatter(
  slip: Float32Array,
  throttlePct: Float32Array,
  maxPoints = 5000,
): SlipThrottleScatter {
  const n = Math.min(slip.length, throttlePct.length);
  let valid = 0;
  for (let i = 0; i < n; i++) if (Number.isFinite(slip[i]) && Number.isFinite(throttlePct[i])) valid++;
  const stride = Math.max(1, Math.ceil(valid / Math.max(1, maxPoints)));
  const size = Math.ceil(valid / stride);
  const th = new Float32Array(size);
  const sl = new Float32Array(size);
  let k = 0;
  let seen = 0;
  for (let i = 0; i < n && k < size; i++) {
    if (!(Number.isFinite(slip[i]) && Number.isFinite(throttlePct[i]))) continue;
    if (seen++ % stride !== 0) continue;
    th[k] = throttlePct[i]!;
    sl[k] = slip[i]!;
    k++;
  }
  return { throttlePct: th, slip: sl };
}
