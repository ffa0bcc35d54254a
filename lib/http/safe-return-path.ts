/**
 * The page to go back to after signing in or up, from a `?next=` parameter. Only a path on this
 * site passes: browsers read `//evil`, `/\evil` and `/\t/evil` as another host, so anything with a
 * backslash, a control character or a second leading slash is refused, and the result must resolve
 * to the same origin.
 */
export function safeReturnPath(next: string | null | undefined, fallback = "/"): string {
  if (typeof next !== "string" || next.length === 0 || next.length > 2048) return fallback;
  if (!next.startsWith("/") || next.startsWith("//")) return fallback;
  if (/[\\\u0000-\u001f\u007f]/.test(next)) return fallback;
  const base = "http://return-path.invalid";
  let u: URL;
  try {
    u = new URL(next, base);
  } catch {
    return fallback;
  }
  if (u.origin !== base) return fallback;
  return u.pathname + u.search + u.hash;
}
