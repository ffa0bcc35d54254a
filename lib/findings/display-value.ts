/**
 * A stored SI value in the unit the trade reads it in: bar for pressure, km/h for speed, mm for
 * travel, % for slip. Factors from NIST SP 811 App. B (bar = 100 000 Pa; km/h = 1/3.6 m/s).
 */
export interface DisplayValue {
  value: number;
  unit: string;
  text: string;
}

const FACTORS: Record<string, { factor: number; unit: string; digits: number }> = {
  Pa: { factor: 1e-5, unit: "bar", digits: 1 },
  "m/s": { factor: 3.6, unit: "km/h", digits: 1 },
  m: { factor: 1000, unit: "mm", digits: 1 },
  rpm: { factor: 1, unit: "rpm", digits: 0 },
  s: { factor: 1, unit: "s", digits: 2 },
  "%": { factor: 1, unit: "%", digits: 0 },
  // Slip ratios are stored as fractions.
  "": { factor: 100, unit: "%", digits: 1 },
  ratio: { factor: 100, unit: "%", digits: 1 },
};

export function displayValue(valueSi: number | null | undefined, siUnit: string | null | undefined): DisplayValue | null {
  if (valueSi == null || !Number.isFinite(valueSi)) return null;
  const f = FACTORS[siUnit ?? ""] ?? { factor: 1, unit: siUnit ?? "", digits: 2 };
  const value = valueSi * f.factor;
  return { value, unit: f.unit, text: `${value.toLocaleString("en-GB", { maximumFractionDigits: f.digits, minimumFractionDigits: f.digits })}${f.unit ? ` ${f.unit}` : ""}` };
}
