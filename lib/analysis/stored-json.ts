/**
 * JSON for stored analysis results that gives back exactly the numbers put in: NaN, ±Infinity
 * and −0 (which JSON.stringify turns into null, null and 0) travel as tagged strings. The pages
 * read NaN as "no value" and a rounded −0.0001 slip is −0, so without this a stored result would
 * differ from the same result computed on request.
 */
const TAG = "\u0000";

export function storedJsonStringify(value: unknown): string {
  return JSON.stringify(value, (_key, v: unknown) => {
    if (typeof v !== "number") return v;
    if (Number.isNaN(v)) return `${TAG}NaN`;
    if (v === Infinity) return `${TAG}Inf`;
    if (v === -Infinity) return `${TAG}-Inf`;
    if (Object.is(v, -0)) return `${TAG}-0`;
    return v;
  });
}

export function storedJsonParse<T>(text: string): T {
  return JSON.parse(text, (_key, v: unknown) => {
    if (typeof v !== "string" || v[0] !== TAG) return v;
    switch (v) {
      case `${TAG}NaN`:
        return NaN;
      case `${TAG}Inf`:
        return Infinity;
      case `${TAG}-Inf`:
        return -Infinity;
      case `${TAG}-0`:
        return -0;
      default:
        return v;
    }
  }) as T;
}
