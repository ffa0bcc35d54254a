import { createHash } from "node:crypto";
import type { CsvColumn } from "./csv-header";
import { normaliseName } from "./suggest-mapping";
import { normaliseUnit } from "./units";

/**
 * SHA-256 (hex, 64 characters) of the header's normalised names and units, in column order:
 * the key an Import profile is saved under, so the next upload with the same header reuses it.
 * Case, spacing, separators and unit spelling variants ("KM/H" vs "km/h") do not change it.
 */
export function headerSignature(columns: Pick<CsvColumn, "name" | "unit">[]): string {
  const canonical = columns.map((c) => `${normaliseName(c.name)}\u001f${normaliseUnit(c.unit)}`).join("\u001e");
  return createHash("sha256").update(canonical, "utf8").digest("hex");
}
