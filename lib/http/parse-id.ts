/**
 * The one id rule for route segments, query values and form fields: a positive whole number that
 * fits the tables' INT key (at most 2³¹ − 1), written as plain digits. Anything else — "", "1e3",
 * " 12", "0x10", "-4", "3.0", a repeated query value — is null, and the caller answers 404 (or a
 * field error), never a query with a guessed id.
 */
export const MAX_ID = 2 ** 31 - 1;

export function parseId(raw: string | number | readonly string[] | null | undefined): number | null {
  if (typeof raw === "number") return Number.isSafeInteger(raw) && raw > 0 && raw <= MAX_ID ? raw : null;
  if (typeof raw !== "string" || !/^\d{1,10}$/.test(raw)) return null;
  const n = Number(raw);
  return n > 0 && n <= MAX_ID ? n : null;
}
