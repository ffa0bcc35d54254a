/**
 * A lap's trace on an even distance grid for drawing: per `bucketM` of distance, the slip of
 * largest magnitude (so spin peaks survive thinning) and the mean of the second channel.
 * Buckets with no finite value hold NaN, which a chart draws as a gap.
 */
export interface BucketedTrace {
  distanceM: Float64Array;
  peak: Float64Array;
  mean: Float64Array;
}

export function bucketByDistance(
  distanceM: ArrayLike<number>,
  peakOf: ArrayLike<number>,
  meanOf: ArrayLike<number> | undefined,
  lengthM: number,
  bucketM = 2,
): BucketedTrace {
  const nb = Math.max(1, Math.ceil(lengthM / bucketM));
  const peak = new Float64Array(nb).fill(NaN);
  const sum = new Float64Array(nb);
  const cnt = new Float64Array(nb);
  for (let i = 0; i < distanceM.length; i++) {
    const b = Math.floor(distanceM[i]! / bucketM);
    if (!(b >= 0 && b < nb)) continue;
    const p = peakOf[i]!;
    if (Number.isFinite(p) && !(Math.abs(p) <= Math.abs(peak[b]!))) peak[b] = p;
    const m = meanOf ? meanOf[i]! : NaN;
    if (Number.isFinite(m)) {
      sum[b]! += m;
      cnt[b]!++;
    }
  }
  const mean = new Float64Array(nb);
  const dist = new Float64Array(nb);
  for (let b = 0; b < nb; b++) {
    mean[b] = cnt[b]! ? sum[b]! / cnt[b]! : NaN;
    dist[b] = (b + 0.5) * bucketM;
  }
  return { distanceM: dist, peak, mean };
}
