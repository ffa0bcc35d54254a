/**
 * The one id rule (lib/http/parse-id.ts) and the one zod-issues → field-errors rule
 * (lib/forms/form-state.ts), which every page, route handler and server action now uses.
 *
 * Id bounds: the tables' keys are MariaDB INT (signed 32-bit), whose largest value is
 * 2 147 483 647 (MariaDB Knowledge Base, "INT"). Number parsing pitfalls checked below are those
 * of ECMAScript's Number(string) (ECMA-262, StringToNumber): it accepts "", " 12", "1e3" and
 * "0x10", none of which is an id someone typed or a link we made.
 */
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { MAX_ID, parseId } from "@/lib/http/parse-id";
import { fieldErrors, optionalId, requiredId } from "@/lib/forms/form-state";

describe("parseId", () => {
  it.each([
    ["1", 1],
    ["42", 42],
    ["2147483647", 2147483647], // MariaDB INT maximum
    ["007", 7],
  ])("%j → %j", (raw, want) => expect(parseId(raw)).toBe(want));

  it.each([["0"], [""], [" 12"], ["12 "], ["1e3"], ["0x10"], ["-4"], ["3.0"], ["2147483648"], ["99999999999"], ["abc"]])("%j → null", (raw) => {
    expect(parseId(raw)).toBeNull();
    // The trap it closes: plain Number() takes most of these as numbers (ECMA-262 StringToNumber).
  });

  it("takes numbers by the same rule", () => {
    expect(parseId(5)).toBe(5);
    expect(parseId(MAX_ID)).toBe(2147483647);
    for (const bad of [0, -1, 1.5, NaN, Infinity, MAX_ID + 1]) expect(parseId(bad)).toBeNull();
  });

  it("a repeated query value, null and undefined are no id", () => {
    expect(parseId(["1", "2"])).toBeNull();
    expect(parseId(null)).toBeNull();
    expect(parseId(undefined)).toBeNull();
  });
});

describe("id form fields", () => {
  it("optionalId: empty is none, digits are an id, anything else is a field error", () => {
    expect(optionalId.parse("")).toBeNull();
    expect(optionalId.parse(" 12 ")).toBe(12);
    for (const bad of ["0", "1e3", "x", "2147483648"]) {
      const r = optionalId.safeParse(bad);
      expect(r.success).toBe(false);
      expect(r.error?.issues[0]?.message).toBe("Choose one from the list");
    }
  });

  it("requiredId: empty is a field error with the caller's message", () => {
    expect(requiredId("Choose a finding").parse("9")).toBe(9);
    expect(requiredId("Choose a finding").safeParse("").error?.issues[0]?.message).toBe("Choose a finding");
  });
});

describe("fieldErrors", () => {
  const schema = z.object({
    title: z.string().min(1, "Give it a title").max(3, "At most 3 characters"),
    columns: z.array(z.object({ unit: z.string().min(1, "Pick a unit") })),
  });

  it("keys by dotted path, first message per field, from a ZodError or its issues", () => {
    const r = schema.safeParse({ title: "", columns: [{ unit: "x" }, { unit: "" }] });
    expect(r.success).toBe(false);
    const want = { title: "Give it a title", "columns.1.unit": "Pick a unit" };
    expect(fieldErrors(r.error!)).toEqual(want);
    expect(fieldErrors(r.error!.issues)).toEqual(want);
  });

  it("an issue about the whole form lands under \"form\"", () => {
    const whole = z.string().refine(() => false, "The form is empty");
    expect(fieldErrors(whole.safeParse("").error!)).toEqual({ form: "The form is empty" });
  });

  it("keeps the first of two messages on one field", () => {
    const two = z.object({ a: z.string().min(5, "too short").regex(/^\d+$/, "digits only") });
    expect(fieldErrors(two.safeParse({ a: "ab" }).error!)).toEqual({ a: "too short" });
  });
});
