/** A positive integer id from a URL segment or query value, or null. */
export function parseId(raw: string | string[] | undefined | null): number | null {
  if (typeof raw !== "string" || !/^\d{1,10}$/.test(raw)) return null;
  const n = Number(raw);
  return n > 0 && Number.isSafeInteger(n) ? n : null;
}
