/** Linear potentiometer calibration: travel = (V − offsetV) · mmPerVolt. */
export interface LinearPotCalibration {
  kind: "linear";
  offsetV: number;
  mmPerVolt: number;
}

/** Two-point calibration: the voltages read at two known travels (e.g. fully extended and a gauge block). */
export interface TwoPointPotCalibration {
  kind: "two_point";
  lowV: number;
  lowMm: number;
  highV: number;
  highMm: number;
}

export type PotCalibration = LinearPotCalibration | TwoPointPotCalibration;

/**
 * Suspension travel (m) from a linear potentiometer's voltage. Calibrations are entered in mm
 * because that is how the travel is measured on the bench; the result is SI.
 */
export function travelFromPot(volts: ArrayLike<number>, calibration: PotCalibration): Float32Array {
  let offsetV: number;
  let mmPerVolt: number;
  if (calibration.kind === "linear") {
    offsetV = calibration.offsetV;
    mmPerVolt = calibration.mmPerVolt;
  } else {
    const { lowV, lowMm, highV, highMm } = calibration;
    if (highV === lowV) throw new RangeError("two-point calibration needs two different voltages");
    mmPerVolt = (highMm - lowMm) / (highV - lowV);
    offsetV = lowV - lowMm / mmPerVolt;
  }
  const mPerVolt = mmPerVolt / 1000;
  const out = new Float32Array(volts.length);
  for (let i = 0; i < volts.length; i++) out[i] = (volts[i]! - offsetV) * mPerVolt;
  return out;
}
