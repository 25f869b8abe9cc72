/** A number typed into a form, or null when the field was left empty (the API then names the field). */
export const numberOrNull = (v: FormDataEntryValue | null): number | null => (v === null || String(v).trim() === "" ? null : Number(v));
