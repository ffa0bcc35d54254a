/**
 * A simple point-mass model of an invented 1000 cc superbike. It is good enough to produce
 * plausible channels whose relations are exact (rpm from rear wheel speed and ratios, lean from
 * speed and curvature); it is not a vehicle-dynamics simulation.
 */

export const G = 9.80665; // standard gravity, m/s² (NIST SP 811)

export const BIKE = {
  name: "Demo 1000 Superbike",
  /** Bike with fuel plus rider. */
  massKg: 245,
  /** Tucked rider drag area; common practice ~0.3 m² for a faired superbike. */
  dragAreaM2: 0.32,
  airDensityKgM3: 1.2,
  rollingResistance: 0.02,
  /** Rear-wheel power; common practice ~210–220 hp (≈160 kW) for a national superbike. */
  rearWheelPowerW: 160_000,
  /** Acceleration cap from wheelie (the front lifts near 1 g on a superbike: common practice). */
  wheelieLimitG: 1.0,
  /** Primary (crank to clutch) reduction; invented. */
  primaryRatio: 1.75,
  /** Gearbox ratios 1st..6th; invented close-ratio race box. */
  gearRatios: [2.5, 1.95, 1.63, 1.42, 1.26, 1.13] as const,
  frontSprocket: 16,
  rearSprocket: 40,
  /**
   * Rolling circumferences, metres. Nominal π·D is 2013.1 mm for 190/55 ZR17 and 1884.3 mm for
   * 120/70 ZR17 (ISO 5751 tyre arithmetic); a loaded tyre rolls a few % smaller, so we
   * choose 1960 mm rear and 1850 mm front.
   */
  rearCircumferenceM: 1.96,
  frontCircumferenceM: 1.85,
  /** Rev ceiling; common practice ~14,000–14,300 rpm for a 1000 cc four. */
  revCeilingRpm: 14_200,
  shiftRpm: 13_800,
  /** Downshift when the next lower gear would stay under this. */
  downshiftRpm: 12_300,
  idleRpm: 1_350,
  forkStrokeMm: 120,
  forkSagMm: 30,
  shockStrokeMm: 65,
  shockSagMm: 20,
} as const;

export const FINAL_RATIO = BIKE.rearSprocket / BIKE.frontSprocket;

/** Crank revolutions per rear-wheel revolution in a gear (1..6). */
export function overallRatio(gear: number): number {
  return BIKE.primaryRatio * BIKE.gearRatios[gear - 1] * FINAL_RATIO;
}

/** Engine rpm for a rear wheel surface speed (m/s, slip included) in a gear, clutch engaged. */
export function rpmFromRearSpeed(rearSpeedMps: number, gear: number): number {
  return (rearSpeedMps / BIKE.rearCircumferenceM) * 60 * overallRatio(gear);
}

/** Aerodynamic plus rolling resistance, as a deceleration (m/s²). */
export function resistanceMps2(speedMps: number): number {
  const drag = 0.5 * BIKE.airDensityKgM3 * BIKE.dragAreaM2 * speedMps * speedMps;
  return drag / BIKE.massKg + BIKE.rollingResistance * G;
}

/** Ideal lean for a point mass on a curve: tan(lean) = v²κ/g. Positive = leaning right. */
export function leanAngleDeg(speedMps: number, kappaPerM: number): number {
  return (-Math.atan((speedMps * speedMps * kappaPerM) / G) * 180) / Math.PI;
}

export interface ProfileInput {
  /** Distance between consecutive path points, metres (length n − 1). */
  dsM: Float64Array;
  kappa: Float64Array;
  /** Lateral grip limit per point, m/s². */
  aLatMax: Float64Array;
  /** Braking limit per point, m/s². */
  aBrakeMax: Float64Array;
  /** Drive limit (wheelie, traction, or a gentle launch in the pit lane), m/s². */
  aDriveMax: Float64Array;
  powerW: Float64Array;
  /** Any other speed cap: pit-lane limit, top gear. */
  vCapMps: Float64Array;
  v0Ms: number;
  vEndMps: number;
}

/**
 * Quasi-steady speed profile: cornering-speed limit from curvature, then a forward pass
 * (power, wheelie and friction-circle limits) and a backward pass (braking, friction circle).
 * The friction-circle share never falls below 30 % so the rider can still trail-brake and pick
 * up the throttle at full lean, as riders do.
 */
export function speedProfile(inp: ProfileInput): Float64Array {
  const n = inp.kappa.length;
  const vLim = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const k = Math.abs(inp.kappa[i]);
    const vCorner = k > 1e-6 ? Math.sqrt(inp.aLatMax[i] / k) : Infinity;
    vLim[i] = Math.min(vCorner, inp.vCapMps[i]);
  }
  vLim[0] = Math.min(vLim[0], inp.v0Ms);
  vLim[n - 1] = Math.min(vLim[n - 1], inp.vEndMps);
  const share = (v: number, i: number) => {
    const r = (v * v * Math.abs(inp.kappa[i])) / inp.aLatMax[i];
    return Math.max(0.3, Math.sqrt(Math.max(0, 1 - r * r)));
  };
  const v = new Float64Array(n);
  v[0] = vLim[0];
  for (let i = 0; i < n - 1; i++) {
    const vi = v[i];
    const drive = Math.min(inp.powerW[i] / (BIKE.massKg * Math.max(vi, 1)), inp.aDriveMax[i]) * share(vi, i);
    const a = drive - resistanceMps2(vi);
    v[i + 1] = Math.min(vLim[i + 1], Math.sqrt(Math.max(0, vi * vi + 2 * a * inp.dsM[i])));
  }
  for (let i = n - 2; i >= 0; i--) {
    const vn = v[i + 1];
    const a = inp.aBrakeMax[i] * share(vn, i + 1) + resistanceMps2(vn);
    v[i] = Math.min(v[i], Math.sqrt(vn * vn + 2 * a * inp.dsM[i]));
  }
  return v;
}

/**
 * Throttle opening from the drive the profile asks for. Power demand maps to opening with an
 * exponent < 1 because a butterfly gives most of its flow early (common practice, invented curve).
 */
export function throttleFromDemand(aLongMps2: number, speedMps: number, powerW: number): number {
  const force = BIKE.massKg * (aLongMps2 + resistanceMps2(speedMps));
  if (force <= 0) return 0;
  const frac = Math.min(1, (force * Math.max(speedMps, 1)) / powerW);
  return 100 * Math.pow(frac, 0.7);
}

/** Engine braking as a deceleration, m/s² (closed throttle, invented). */
export const ENGINE_BRAKING_MS2 = 0.08 * G;

/** Front brake line pressure for the deceleration the brakes must supply (11 bar per g). */
export function frontBrakeBar(aLongMps2: number, speedMps: number, gainBarPerG: number): number {
  const brakeDecel = -aLongMps2 - resistanceMps2(speedMps) - ENGINE_BRAKING_MS2;
  return brakeDecel > 0 ? (brakeDecel / G) * gainBarPerG : 0;
}

/**
 * Gear selection: upshift at the shift rpm while driving, downshift on the brakes to keep the
 * engine in its band, neutral when stopped. `holdUpshift` lets the caller delay one shift (the
 * planted rev-ceiling touch).
 */
export class GearSelector {
  gear = 0;

  update(rearSpeedMps: number, driving: boolean, holdUpshift: boolean): number {
    if (rearSpeedMps < 0.5 && !driving) {
      this.gear = 0;
      return 0;
    }
    if (this.gear === 0) this.gear = 1;
    if (!holdUpshift) {
      while (this.gear < 6 && rpmFromRearSpeed(rearSpeedMps, this.gear) >= BIKE.shiftRpm) this.gear++;
    }
    if (!driving) {
      while (this.gear > 1 && rpmFromRearSpeed(rearSpeedMps, this.gear - 1) <= BIKE.downshiftRpm) this.gear--;
    }
    return this.gear;
  }
}

/** Engine rpm with a slipping clutch below the speed where 1st gear engages fully. */
export function engineRpm(rearSpeedMps: number, gear: number, throttlePct: number): number {
  if (gear === 0) return BIKE.idleRpm;
  const wheelRpm = rpmFromRearSpeed(rearSpeedMps, gear);
  if (gear === 1) {
    const clutchRpm = BIKE.idleRpm + 40 * throttlePct + 1500;
    if (wheelRpm < clutchRpm) return clutchRpm;
  }
  return wheelRpm;
}

/**
 * Rear wheel slip ratio (rear over front, minus 1): small drive slip on straights, engine-braking
 * slip on the brakes, and spin on corner exits (still leaning, throttle opening) held by traction
 * control, which shows as a ripple.
 */
export function rearSlip(p: {
  throttlePct: number;
  leanDeg: number;
  decelG: number;
  spinPeak: number;
  timeS: number;
}): number {
  if (p.decelG > 0.15) return -(0.004 + 0.015 * Math.min(p.decelG, 1.3));
  const drive = 0.004 + 0.011 * (p.throttlePct / 100);
  const leanShare = Math.min(1, Math.max(0, (Math.abs(p.leanDeg) - 12) / 22));
  const openShare = Math.min(1, Math.max(0, (p.throttlePct - 25) / 45));
  const ripple = 1 + 0.1 * Math.sin(2 * Math.PI * 9 * p.timeS);
  return Math.min(0.12, drive + p.spinPeak * leanShare * openShare * ripple);
}

/** Fork travel from weight transfer and cornering load, mm (before lag and bumps). */
export function forkTravelTargetMm(aLongMps2: number, leanDeg: number): number {
  const loadFactor = 1 / Math.cos((leanDeg * Math.PI) / 180);
  const gLong = aLongMps2 / G;
  const dive = gLong < 0 ? -gLong * 44 : -gLong * 18;
  return BIKE.forkSagMm + dive + (loadFactor - 1) * 22;
}

/** Shock travel: squat under drive, extension under braking, cornering load; mm. */
export function shockTravelTargetMm(aLongMps2: number, leanDeg: number): number {
  const loadFactor = 1 / Math.cos((leanDeg * Math.PI) / 180);
  const gLong = aLongMps2 / G;
  const pitch = gLong > 0 ? gLong * 16 : gLong * 8;
  return BIKE.shockSagMm + pitch + (loadFactor - 1) * 14;
}
