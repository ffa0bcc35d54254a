import "server-only";
/** Bikes as plain objects: list, read, create, update settings. Team and role checks inside. */
import { z } from "zod";
import { initModels, Bike, Engine } from "@/models";
import type { TeamContext } from "@/lib/auth/guard";
import { notFound } from "@/lib/http/http-error";
import { assertCanEditSetup } from "./setup-access";
import { jsonColumn } from "./json-column";
import { optionalNumber } from "@/lib/forms/form-fields";

/**
 * Ranges are plausibility limits for a road-racing motorcycle, there to catch typos (a rear
 * circumference typed in cm, a ratio with the decimal point missing), not class rules.
 */
export const bikeSettingsSchema = z
  .object({
    name: z.string({ message: "Name the bike" }).trim().min(1, "Name the bike, e.g. its race number").max(120, "Keep the name under 120 characters"),
    className: z.string().trim().max(80, "Keep the class under 80 characters").transform((s) => s || null),
    wheelCircFrontMm: optionalNumber("Front rolling circumference", 1000, 2600, "mm"),
    wheelCircRearMm: optionalNumber("Rear rolling circumference", 1000, 2600, "mm"),
    primaryRatio: optionalNumber("Primary ratio", 1, 4),
    gearboxRatios: z
      .string()
      .trim()
      .transform((s) => (s === "" ? [] : s.split(/[\s;,]+/).filter(Boolean)))
      .superRefine((parts, ctx) => {
        if (parts.length > 8) ctx.addIssue({ code: "custom", message: "At most 8 gears" });
        parts.forEach((p, i) => {
          const n = Number(p);
          if (!Number.isFinite(n)) ctx.addIssue({ code: "custom", message: `Gear ${i + 1}: "${p}" is not a number` });
          else if (n < 0.5 || n > 4) ctx.addIssue({ code: "custom", message: `Gear ${i + 1}: ${n} is outside 0.5–4` });
          else if (i > 0 && n >= Number(parts[i - 1])) ctx.addIssue({ code: "custom", message: `Gear ${i + 1} (${n}) must be a lower ratio than gear ${i} (${parts[i - 1]}): list 1st gear first` });
        });
      })
      .transform((parts) => (parts.length ? parts.map(Number) : null)),
    sprocketFront: optionalNumber("Front sprocket", 10, 25, "teeth", { integer: true }),
    sprocketRear: optionalNumber("Rear sprocket", 25, 60, "teeth", { integer: true }),
    revCeilingRpm: optionalNumber("Rev ceiling", 3000, 25000, "rpm"),
    forkStrokeMm: optionalNumber("Fork stroke", 50, 200, "mm"),
    shockStrokeMm: optionalNumber("Shock stroke", 20, 150, "mm"),
    tyreCrownRadiusMm: optionalNumber("Rear tyre crown radius", 20, 200, "mm"),
    tyreCrownRadiusFrontMm: optionalNumber("Front tyre crown radius", 20, 200, "mm"),
  });
export type BikeSettingsInput = z.input<typeof bikeSettingsSchema>;

export const bikeCreateSchema = bikeSettingsSchema.pick({ name: true, className: true });

export interface BikeSummary {
  id: number;
  name: string;
  className: string | null;
  revCeilingRpm: number | null;
  engineSerials: string[];
}

export interface BikeDetail {
  id: number;
  name: string;
  className: string | null;
  wheelCircFrontMm: number | null;
  wheelCircRearMm: number | null;
  primaryRatio: number | null;
  gearboxRatios: number[];
  sprocketFront: number | null;
  sprocketRear: number | null;
  revCeilingRpm: number | null;
  forkStrokeMm: number | null;
  shockStrokeMm: number | null;
  tyreCrownRadiusMm: number | null;
  tyreCrownRadiusFrontMm: number | null;
}

function toDetail(b: Bike): BikeDetail {
  return {
    id: b.id,
    name: b.name,
    className: b.className,
    wheelCircFrontMm: b.wheelCircFrontMm,
    wheelCircRearMm: b.wheelCircRearMm,
    primaryRatio: b.primaryRatio,
    gearboxRatios: jsonColumn<number[]>(b.gearboxRatios) ?? [],
    sprocketFront: b.sprocketFront,
    sprocketRear: b.sprocketRear,
    revCeilingRpm: b.revCeilingRpm,
    forkStrokeMm: b.forkStrokeMm,
    shockStrokeMm: b.shockStrokeMm,
    tyreCrownRadiusMm: b.tyreCrownRadiusMm,
    tyreCrownRadiusFrontMm: b.tyreCrownRadiusFrontMm ?? null,
  };
}

export async function ownBike(ctx: TeamContext, id: number): Promise<Bike> {
  initModels();
  const b = await Bike.findOne({ where: { id, teamId: ctx.teamId } });
  if (!b) throw notFound("Bike");
  return b;
}

export async function listBikes(ctx: TeamContext): Promise<BikeSummary[]> {
  initModels();
  const [bikes, engines] = await Promise.all([
    Bike.findAll({ where: { teamId: ctx.teamId }, order: [["name", "ASC"]] }),
    Engine.findAll({ where: { teamId: ctx.teamId }, order: [["serial", "ASC"]] }),
  ]);
  return bikes.map((b) => ({
    id: b.id,
    name: b.name,
    className: b.className,
    revCeilingRpm: b.revCeilingRpm,
    engineSerials: engines.filter((e) => e.bikeId === b.id).map((e) => e.serial),
  }));
}

export async function getBike(ctx: TeamContext, id: number): Promise<BikeDetail> {
  return toDetail(await ownBike(ctx, id));
}

export async function createBike(ctx: TeamContext, raw: unknown): Promise<{ id: number }> {
  assertCanEditSetup(ctx);
  const input = bikeCreateSchema.parse(raw);
  initModels();
  const b = await Bike.create({
    teamId: ctx.teamId, name: input.name, className: input.className, wheelCircFrontMm: null, wheelCircRearMm: null, primaryRatio: null, gearboxRatios: null,
    sprocketFront: null, sprocketRear: null, revCeilingRpm: null, forkStrokeMm: null, shockStrokeMm: null, tyreCrownRadiusMm: null, tyreCrownRadiusFrontMm: null, calibrations: null, thresholds: null,
  });
  return { id: b.id };
}

export async function updateBike(ctx: TeamContext, id: number, raw: unknown): Promise<BikeDetail> {
  assertCanEditSetup(ctx);
  const b = await ownBike(ctx, id);
  const input = bikeSettingsSchema.parse(raw);
  await b.update(input);
  return toDetail(b);
}
