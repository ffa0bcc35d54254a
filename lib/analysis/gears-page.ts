/**
 * Gears page: the gear per sample (logged, or from the bike's ratios), time in each gear and the
 * shifts. Pure (no database).
 */
import { gearFromRatios } from "@/lib/gear/gear-from-ratios";
import { timeInGear, type TimeInGear } from "@/lib/gear/time-in-gear";
import { shiftEvents } from "@/lib/gear/shift-events";
import type { AnalysisBase } from "./analysis-base";
import { lapAt } from "./page-helpers";

export interface GearAnalysis {
  source: "logged" | "ratios" | "none";
  reason?: string;
  rows: TimeInGear[];
  shifts: { lap: number | null; timeS: number; fromGear: number; toGear: number; direction: "up" | "down"; clutchless: boolean; rpmBefore: number; rpmAfter: number; shiftTimeS: number }[];
  clutchlessUpshifts: number;
  upshifts: number;
}

export function computeGears(base: AnalysisBase): GearAnalysis {
  const { series, bike } = base;
  const c = series.channels;
  let gear: Uint8Array | null = null;
  let source: GearAnalysis["source"] = "none";
  if (c.gear) {
    // A plain loop: Uint8Array.from over a typed array goes through its iterator and first
    // collects every sample into a JS list (~0.2 s and tens of MB of heap for a 2.5-hour log).
    const logged = c.gear;
    const g = new Uint8Array(logged.length);
    for (let i = 0; i < logged.length; i++) {
      const x = logged[i];
      g[i] = Number.isFinite(x) && x > 0 ? Math.round(x) : 0;
    }
    gear = g;
    source = "logged";
  } else if (c.engine_rpm && c.speed_rear && bike?.primaryRatio && bike.gearboxRatios?.length && bike.sprocketFront && bike.sprocketRear && bike.wheelCircRearMm) {
    gear = gearFromRatios(c.engine_rpm, c.speed_rear, {
      primaryRatio: bike.primaryRatio,
      gearboxRatios: bike.gearboxRatios,
      sprocketFront: bike.sprocketFront,
      sprocketRear: bike.sprocketRear,
      rearCircumferenceM: bike.wheelCircRearMm / 1000,
    });
    source = "ratios";
  }
  if (!gear) {
    return { source, reason: "No gear channel, and the bike's ratios, sprockets and rear wheel circumference are not all set (or engine speed / rear wheel speed is missing).", rows: [], shifts: [], clutchlessUpshifts: 0, upshifts: 0 };
  }
  const rpm = c.engine_rpm ?? new Float32Array(gear.length).fill(NaN);
  const shifts = shiftEvents(gear, rpm, c.throttle, series.timeS).map((s) => {
    const k = lapAt(base, s.timeS);
    return { lap: k >= 0 ? base.laps[k].number : null, timeS: s.timeS, fromGear: s.fromGear, toGear: s.toGear, direction: s.direction, clutchless: s.clutchless, rpmBefore: s.rpmBefore, rpmAfter: s.rpmAfter, shiftTimeS: s.shiftTimeS };
  });
  return {
    source,
    rows: timeInGear(gear, series.timeS),
    shifts,
    clutchlessUpshifts: shifts.filter((s) => s.clutchless).length,
    upshifts: shifts.filter((s) => s.direction === "up").length,
  };
}
