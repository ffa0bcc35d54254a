import type { TimeFormat } from "./mapping";
import { normaliseUnit } from "./units";

/** ISO 8601 date-time: 2024-05-01T10:00:00.125Z, also with a space, an offset or no zone (read as UTC). */
export const ISO_8601_DATE_TIME = /^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})?$/;

/**
 * Time format of a time column from its unit and first values. A unit decides (s / ms); else ISO
 * 8601 text is recognised; else whole numbers stepping by 1 or more are read as milliseconds
 * (a 1 kHz–0.5 Hz log in ms: a logger writing whole seconds would be logging at 1 Hz or slower,
 * which no chassis logger does, while 1 kHz in integer ms is common), anything else as seconds.
 * Step 1 gets a lower confidence: a GPS-only export at 1 Hz in whole seconds looks the same.
 * `confidence` is 0–1.
 */
export function detectTimeFormat(unit: string, firstValues: string[]): { format: TimeFormat; confidence: number } {
  const u = normaliseUnit(unit);
  if (["s", "sec", "secs", "second", "seconds"].includes(u)) return { format: "seconds", confidence: 1 };
  if (["ms", "msec", "millisecond", "milliseconds"].includes(u)) return { format: "milliseconds", confidence: 1 };
  const values = firstValues.map((v) => v.trim()).filter((v) => v !== "");
  if (values.length === 0) return { format: "seconds", confidence: 0.3 };
  if (values.every((v) => ISO_8601_DATE_TIME.test(v))) return { format: "iso8601", confidence: 1 };
  const nums = values.map((v) => Number(v.replace(",", ".")));
  if (nums.some((n) => !Number.isFinite(n))) return { format: "seconds", confidence: 0.2 };
  const steps: number[] = [];
  for (let i = 1; i < nums.length; i++) steps.push(nums[i] - nums[i - 1]);
  const allIntegers = values.every((v) => /^[+-]?\d+$/.test(v));
  if (allIntegers && steps.length > 0 && steps.every((s) => s >= 2)) return { format: "milliseconds", confidence: 0.7 };
  if (allIntegers && steps.length > 0 && steps.every((s) => s >= 1)) return { format: "milliseconds", confidence: 0.5 };
  return { format: "seconds", confidence: steps.length > 0 ? 0.7 : 0.5 };
}
