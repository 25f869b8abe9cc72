import { lengthToMm, type LengthUnit } from "@/lib/units";

/** A number typed into a form, or null when the field was left empty (the API then names the field). */
export const numberOrNull = (v: FormDataEntryValue | null): number | null =>
  v === null || String(v).trim() === "" ? null : Number(v);

/** A length typed in the person's unit, in mm (null when left empty). */
export const lengthMmOrNull = (v: FormDataEntryValue | null, unit: LengthUnit): number | null => {
  const n = numberOrNull(v);
  return n === null ? null : lengthToMm(n, unit);
};

/**
 * The server's message for a field, or for anything under it (`size` also finds `size.1`); the
 * first of several names that has one.
 */
export function fieldError(fields: Record<string, string>, ...names: string[]): string | undefined {
  for (const k of names) {
    const hit = Object.entries(fields).find(([f]) => f === k || f.startsWith(`${k}.`));
    if (hit) return hit[1];
  }
  return undefined;
}
