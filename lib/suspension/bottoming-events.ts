export interface BottomingOptions {
  /** Travel within this of full stroke counts as bottoming (m). Default 3 mm, Lapbench's setting. */
  marginM?: number;
  /** Touches closer together than this are one event (s). Default 0.2 s, Lapbench's setting. */
  debounceS?: number;
}

export interface BottomingEvent {
  startIndex: number;
  endIndex: number;
  startTimeS: number;
  endTimeS: number;
  peakTravelM: number;
}

/**
 * Bottoming events: travel at or beyond (stroke − margin), with touches closer than the
 * debounce time merged into one event (one hit over a kerb often rings twice).
 */
export function bottomingEvents(
  travelM: ArrayLike<number>,
  timeS: Float64Array,
  strokeM: number,
  opts: BottomingOptions = {},
): BottomingEvent[] {
  const limit = strokeM - (opts.marginM ?? 0.003);
  const debounceS = opts.debounceS ?? 0.2;
  const events: BottomingEvent[] = [];
  let cur: BottomingEvent | null = null;
  for (let i = 0; i < travelM.length; i++) {
    const x = travelM[i]!;
    if (!(x >= limit)) continue;
    if (cur && timeS[i]! - cur.endTimeS <= debounceS) {
      cur.endIndex = i;
      cur.endTimeS = timeS[i]!;
      if (x > cur.peakTravelM) cur.peakTravelM = x;
    } else {
      cur = { startIndex: i, endIndex: i, startTimeS: timeS[i]!, endTimeS: timeS[i]!, peakTravelM: x };
      events.push(cur);
    }
  }
  return events;
}
