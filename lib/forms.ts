import { inToMm, type LengthUnit } from "@/lib/units";

/** A number typed into a form, or null when the field was left empty (the API then names the field). */
export const numberOrNull = (v: FormDataEntryValue | null): number | null => (v === null || String(v).trim() === "" ? null : Number(v));

/** A length typed in the person's unit, in mm (null when left empty). */
export const lengthMmOrNull = (v: FormDataEntryValue | null, unit: LengthUnit): number | null => {
  const n = numberOrNull(v);
  return n !== null && unit === "in" ? inToMm(n) : n;
};
