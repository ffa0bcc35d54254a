/**
 * The stored JSON shapes of a track's gates and corners (columns `tracks.gates` and
 * `tracks.corners`): plain types shared by the data layer and the gate editor in the browser.
 */
export interface GatePoint {
  lat: number;
  lon: number;
}
export interface Gate {
  a: GatePoint;
  b: GatePoint;
}
export interface TrackGates {
  startFinish: Gate | null;
  sectors: Gate[];
  pitEntry: Gate | null;
  pitExit: Gate | null;
}
export interface TrackCorner {
  name: string;
  distanceM: number;
}
