/** A geographic position in decimal degrees (WGS-84), north and east positive. */
export interface LatLon {
  lat: number;
  lon: number;
}

/**
 * A timing gate: a line segment across the track from `a` to `b`.
 *
 * Direction convention (ours): a crossing counts as forward when the bike passes from the LEFT
 * side of the directed line a→b to its RIGHT side (left/right as seen looking from `a` to `b`).
 * For the rider approaching the gate this means `a` is on the rider's RIGHT and `b` on the
 * rider's LEFT. Example: a bike riding east crosses a gate with `a` south of the track and `b`
 * north of it forward. `gateAcrossPath` builds gates with this orientation from the path.
 */
export interface Gate {
  a: LatLon;
  b: LatLon;
}

/** Fixes of a GPS track: parallel arrays, time strictly increasing. Degrees, seconds. */
export interface GpsFixes {
  timeS: Float64Array;
  latDeg: Float64Array | Float32Array;
  lonDeg: Float64Array | Float32Array;
}
