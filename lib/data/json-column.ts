/** JSON columns come back as text from some MariaDB versions; parse them at the boundary. */
export function jsonColumn<T>(v: unknown): T | null {
  if (v == null) return null;
  if (typeof v === "string") {
    try {
      return JSON.parse(v) as T;
    } catch {
      return null;
    }
  }
  return v as T;
}
