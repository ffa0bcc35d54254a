/**
 * What the series API answers for Compare, shared by server (lib/data/lap-series.ts) and browser
 * (lib/client/lap-series.ts). Numbers index into the binary message's arrays (lib/series/binary.ts).
 * All values SI: x in m (distance) or s (time since each lap's start); channels in their role's
 * SI unit; running gap in s.
 */
export type SeriesX = "distance" | "time";

export interface LapRef {
  sessionId: number;
  lap: number;
}

export interface LapSeriesLapMeta extends LapRef {
  sessionTitle: string;
  riderName: string | null;
  lapTimeMs: number;
  /** The lap's own length, m (GPS-rescaled wheel distance, or GPS distance). */
  lengthM: number;
  /**
   * Factor applied to this lap's distance so it spans the reference lap's length: corners line
   * up and the Running gap at the line equals the lap-time difference (common practice for
   * overlays; the difference is a few metres of GPS path per lap).
   */
  distanceScale: number;
  outLap: boolean;
  inLap: boolean;
  pitPass: boolean;
  invalid: boolean;
}

export interface LapSeriesPane {
  role: string;
  label: string;
  /** SI unit of the values (ROLE_SI_UNIT). */
  unit: string;
  /** Array index of this pane's x column. */
  x: number;
  /** Array index of each lap's values (same order as `laps`), null where the lap's session lacks the channel. */
  series: (number | null)[];
  /** True when min/max decimation to the pixel width was applied. */
  decimated: boolean;
}

/** A named corner of the track along the reference lap, and how each lap went through it. */
export interface LapSeriesCorner {
  name: string;
  /** Apex on the x axis (m or s of the reference lap). */
  x: number;
  /** The corner's stretch on the x axis: halfway from the previous apex to halfway to the next. */
  fromX: number;
  toX: number;
  /** The same stretch in distance along the reference lap, m. */
  fromM: number;
  toM: number;
  /** Per lap (same order as `laps`), null where the lap has no speed channel. */
  laps: ({
    /** Speed where the stretch begins, m/s. */
    entrySpeedMps: number;
    /** Where front brake pressure first passed the braking threshold, m from the lap start (null: no braking or no brake channel). */
    brakingPointM: number | null;
    /** Lowest speed in the stretch, m/s, and where, m. */
    minSpeedMps: number;
    apexM: number;
    /** Speed where the stretch ends, m/s. */
    exitSpeedMps: number;
    /** Time through the stretch, s. */
    timeS: number;
    /** Time gained on the reference lap in this stretch, s (+ = gained; 0 for the reference). */
    gainedS: number;
  } | null)[];
}

export interface LapSeriesMeta {
  x: SeriesX;
  xUnit: "m" | "s";
  /** Index into `laps` of the reference lap (the first asked for). */
  reference: 0;
  laps: LapSeriesLapMeta[];
  /** Points of the common grid before decimation (1 m or one sample period). */
  gridPoints: number;
  gridStep: number;
  panes: LapSeriesPane[];
  /** Roles asked for that none of the laps' sessions has. */
  missing: string[];
  /** Running gap of each lap against the reference (series[0] is null: the reference itself). */
  gap: { x: number; series: (number | null)[]; decimated: boolean } | null;
  /** Reference lap's path in local metres (east, north) at x positions, for the track outline. */
  track: { x: number; eastM: number; northM: number } | null;
  /** The x window these arrays cover (SI), the whole lap unless a window was asked for. */
  window: [number, number];
  /** Length of the whole common grid in x (SI), whatever the window. */
  fullX: [number, number];
  /** Sector bands of the reference lap on the x axis (from its sector times). */
  sectors: { name: string; fromX: number; toX: number }[];
  /** The track's named corners (or corners found from the reference lap's speed), in lap order. */
  corners: LapSeriesCorner[];
  /** Where the corners come from. */
  cornerSource: "track" | "found" | "none";
}
