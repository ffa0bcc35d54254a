import path from "node:path";
import { describe, expect, it } from "vitest";
import { gearFromRatios } from "@/lib/gear/gear-from-ratios";
import { BIKE } from "@/sample-logs/bike-model";
import { readSampleCsv } from "../findings/read-sample-csv";
import { at } from "../../fixtures/at";

/** Gear from rpm and rear wheel speed against the gear the sample-log generator logged (invented bike). */
describe("gearFromRatios on the generated three-lap sample log", () => {
  it("agrees with the logged gear on ≥ 98 % of driving samples and never names a wrong gear", () => {
    const s = readSampleCsv(path.resolve(__dirname, "../../../sample-logs/files/three-laps-20hz.csv"));
    const gear = gearFromRatios(s.channels.engine_rpm!, s.channels.speed_rear!, {
      primaryRatio: BIKE.primaryRatio,
      gearboxRatios: BIKE.gearRatios,
      sprocketFront: BIKE.frontSprocket,
      sprocketRear: BIKE.rearSprocket,
      rearCircumferenceM: BIKE.rearCircumferenceM,
    });
    const logged = s.channels.gear!;
    let driving = 0;
    let agree = 0;
    let wrong = 0;
    for (let i = 0; i < gear.length; i++) {
      if (!(at(logged, i) > 0 && at(s.channels.speed_rear!, i) > 2)) continue;
      driving++;
      if (gear[i] === logged[i]) agree++;
      else if (gear[i] !== 0) wrong++;
    }
    expect(driving).toBeGreaterThan(10000);
    expect(agree / driving).toBeGreaterThan(0.98);
    expect(wrong).toBe(0);
  });
});
