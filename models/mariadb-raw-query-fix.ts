/**
 * Sequelize 6 + the mariadb 3.x driver: on raw queries Sequelize does `delete data.meta`, but the
 * driver defines `meta` on the result array as a non-configurable property, so every
 * `sequelize.query(sql)` without a `type` (and queryInterface.removeColumn, used by migrations)
 * throws "TypeError: Cannot delete property 'meta' of [object Array]" (sequelize issue 15701).
 *
 * Fix at the one place it breaks: before Sequelize formats a result, hand it a plain copy of the
 * rows with an ordinary (deletable) `meta`. Rows are not copied, only the array of references.
 * tests/integration/mariadb-raw-query.test.ts proves the failure without the patch and the fix.
 */
import MariadbQuery from "sequelize/lib/dialects/mariadb/query";

type FormatResults = (this: unknown, data: unknown) => unknown;
interface QueryProto {
  formatResults: FormatResults & { __lapbenchPatched?: boolean };
}

export function applyMariadbRawQueryFix(): void {
  const proto = (MariadbQuery as unknown as { prototype: QueryProto }).prototype;
  if (proto.formatResults.__lapbenchPatched) return;
  const original = proto.formatResults;
  const patched: QueryProto["formatResults"] = function (this: unknown, data: unknown) {
    if (Array.isArray(data)) {
      const desc = Object.getOwnPropertyDescriptor(data, "meta");
      if (desc && !desc.configurable) {
        const copy: unknown[] & { meta?: unknown } = data.slice();
        copy.meta = desc.value;
        return original.call(this, copy);
      }
    }
    return original.call(this, data);
  };
  patched.__lapbenchPatched = true;
  (patched as unknown as { __original: FormatResults }).__original = original;
  proto.formatResults = patched;
}

/** Undo the fix (tests only: to prove the driver problem still exists). */
export function removeMariadbRawQueryFixForTest(): () => void {
  const proto = (MariadbQuery as unknown as { prototype: QueryProto }).prototype;
  const current = proto.formatResults;
  if (!current.__lapbenchPatched) return () => {};
  const original = (current as unknown as { __original?: FormatResults }).__original;
  if (!original) return () => {};
  proto.formatResults = original;
  return () => {
    proto.formatResults = current;
  };
}
