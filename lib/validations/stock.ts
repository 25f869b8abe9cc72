import { z } from "zod";
import { DEFECT_KINDS, LEDGER_KINDS, MATERIALS, SHOWN_STATUSES } from "@/lib/stock";
import { receivedCodeProblem } from "@/lib/block-code";
import { MIN_SIZE_MM } from "@/lib/units";

const text = (label: string, max = 200) =>
  z
    .string({ error: `${label} must be text.` })
    .trim()
    .max(max, `${label}: at most ${max} characters.`);
const required = (label: string, max = 200) => text(label, max).min(1, `Enter ${label.toLowerCase()}.`);
const optionalText = (label: string, max = 500) =>
  text(label, max)
    .optional()
    .nullable()
    .transform((v) => (v ? v : null));
const positive = (label: string, max = 100_000) =>
  z
    .number({ error: `${label} must be a number.` })
    .finite(`${label} must be a number.`)
    .gt(0, `${label} must be more than 0.`)
    .max(max, `${label} must be at most ${max}.`);
const nonNegative = (label: string, max = 10_000_000) =>
  z
    .number({ error: `${label} must be a number.` })
    .finite(`${label} must be a number.`)
    .min(0, `${label} cannot be negative.`)
    .max(max, `${label} must be at most ${max}.`);
const date = (label: string) => z.iso.date({ error: `${label} must be a date (YYYY-MM-DD).` });
const colour = z.string().regex(/^#[0-9a-fA-F]{6}$/, "Use a colour like #3a7bd5.");

export const gradeSchema = z
  .object({
    code: required("Code", 40),
    material: z.enum(MATERIALS, { error: "Choose EPS, XPS, EPP or PU." }),
    gradeSystem: required("Grade system", 40),
    grade: required("Grade", 60),
    nominalDensity: positive("Nominal density", 1000).nullable().optional(),
    minDensity: positive("Minimum density", 1000).nullable().optional(),
    cureDays: z
      .number({ error: "Cure days must be a number." })
      .int("Cure days must be whole days.")
      .min(0, "Cure days cannot be negative.")
      .max(365, "At most 365 days."),
    neverHotWire: z.boolean({ error: "Must be true or false." }),
    colour,
    priceUnit: z.enum(["m3", "bf"], { error: "Price per m³ or per board foot." }),
    notes: optionalText("Notes"),
  })
  .refine((g) => g.material !== "PU" || g.neverHotWire, {
    path: ["neverHotWire"],
    message: "Polyurethane must never be hot-wired: keep this on.",
  })
  .refine((g) => g.minDensity == null || g.nominalDensity == null || g.minDensity <= g.nominalDensity, {
    path: ["minDensity"],
    message: "The minimum density cannot exceed the nominal density.",
  });
export type GradeInput = z.infer<typeof gradeSchema>;

export const supplierSchema = z.object({
  name: required("Name", 120),
  contact: optionalText("Contact", 120),
  email: z
    .email({ error: "Enter a valid e-mail address." })
    .max(320)
    .nullable()
    .optional()
    .or(z.literal("").transform(() => null)),
  phone: optionalText("Phone", 60),
  /** Working days, as suppliers quote them. */
  leadTimeDays: z
    .number({ error: "Lead time must be a number." })
    .int("Lead time must be whole working days.")
    .min(0, "Lead time cannot be negative.")
    .max(365, "At most 365 working days."),
  /** How many working days deliveries stray from the promised date (one standard deviation); left out: unchanged. */
  leadTimeSdDays: z
    .number({ error: "Lead time spread must be a number." })
    .finite("Lead time spread must be a number.")
    .min(0, "Lead time spread cannot be negative.")
    .max(100, "At most 100 working days.")
    .optional(),
  notes: optionalText("Notes"),
  active: z.boolean().optional(),
});
export type SupplierInput = z.infer<typeof supplierSchema>;

/** A measured side in mm: more than 0 and at least what the register keeps (0.01 mm), else it would be stored as 0. */
const side = (label: string) =>
  positive(label, 30_000).min(MIN_SIZE_MM, `${label} must be at least ${MIN_SIZE_MM} mm (sizes are kept to 0.01 mm).`);
export const sizeSchema = z.tuple([side("Length"), side("Width"), side("Height")]);

export const receivedBlockSchema = z.object({
  // Letters, digits and "-": no invisible or look-alike characters, no "." (offcut codes are Blockyard's).
  code: text("Code", 40)
    .optional()
    .nullable()
    .superRefine((v, ctx) => {
      const problem = v ? receivedCodeProblem(v) : null;
      if (problem) ctx.addIssue({ code: "custom", message: problem });
    })
    .transform((v) => (v ? v.toUpperCase() : null)),
  gradeId: z.number({ error: "Choose a grade." }).int().positive("Choose a grade."),
  size: sizeSchema,
  nominalSize: sizeSchema.nullable().optional(),
  // Kept to the gram: a lighter weight would be stored as 0.
  weightKg: positive("Weight", 10_000).min(0.001, "Weight must be at least 0.001 kg.").nullable().optional(),
  cost: nonNegative("Cost"),
  location: required("Location", 60),
  mouldedOn: date("Moulding date").nullable().optional(),
});

export const deliverySchema = z.object({
  supplierId: z.number({ error: "Choose a supplier." }).int().positive("Choose a supplier."),
  receivedOn: date("Received on"),
  poRef: optionalText("PO reference", 60),
  lot: required("Lot", 60),
  notes: optionalText("Notes"),
  blocks: z.array(receivedBlockSchema).min(1, "Add at least one block.").max(500, "At most 500 blocks per delivery."),
});
export type DeliveryInput = z.infer<typeof deliverySchema>;

const SORTS = ["code", "grade", "volume", "cut_not_before", "received", "location", "cost"] as const;

/** The stock list's query string. Unknown values are refused with 400, not ignored. */
export const blockQuerySchema = z.object({
  q: z.string().trim().max(60).optional(),
  grade: z.coerce.number().int().positive().optional(),
  status: z.enum([...SHOWN_STATUSES, "available", "all"] as const).optional(),
  location: z.string().trim().max(60).optional(),
  minLength: z.coerce.number().finite().min(0).optional(),
  maxLength: z.coerce.number().finite().min(0).optional(),
  minVolume: z.coerce.number().finite().min(0).optional(),
  offcuts: z.enum(["only", "exclude"]).optional(),
  sort: z.enum(SORTS).default("received"),
  dir: z.enum(["asc", "desc"]).default("asc"),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
  /**
   * Keyset paging: the page after (or before) the row this cursor names, as `next` and `prev` of
   * an answer give them; `page` is then only the number shown. Any depth costs the same.
   */
  after: z.string().max(300, { error: "after is a cursor from a list answer." }).optional(),
  before: z.string().max(300, { error: "before is a cursor from a list answer." }).optional(),
});
export type BlockQuery = z.infer<typeof blockQuerySchema>;

export const blockPatchSchema = z
  .object({
    location: required("Location", 60).optional(),
    notes: optionalText("Notes").optional(),
  })
  .strict();

export const scrapSchema = z.object({ reason: required("Reason", 300) });

export const adjustSchema = z.object({
  size: sizeSchema,
  reason: required("Reason", 300),
});

export const defectSchema = z
  .object({
    kind: z.enum(DEFECT_KINDS, { error: "Choose what kind of defect it is." }),
    min: z.tuple([nonNegative("min x", 30_000), nonNegative("min y", 30_000), nonNegative("min z", 30_000)]),
    max: z.tuple([positive("max x", 30_000), positive("max y", 30_000), positive("max z", 30_000)]),
    note: optionalText("Note"),
  })
  .superRefine((d, ctx) => {
    (["x", "y", "z"] as const).forEach((axis, i) => {
      if (d.max[i]! <= d.min[i]!)
        ctx.addIssue({ code: "custom", path: ["max", i], message: `max ${axis} must be more than min ${axis}.` });
      // Kept to 0.01 mm: a thinner zone would be stored with max = min.
      else if (d.max[i]! - d.min[i]! < MIN_SIZE_MM - 1e-9)
        ctx.addIssue({
          code: "custom",
          path: ["max", i],
          message: `max ${axis} must be at least ${MIN_SIZE_MM} mm more than min ${axis} (sizes are kept to 0.01 mm).`,
        });
    });
  });
export type DefectInput = z.infer<typeof defectSchema>;

/**
 * A correction of a zone: any of kind, min, max and note. The box as it ends up (the zone's own
 * values for what is left out) is checked on the server: each max above its min, inside the block.
 */
export const defectPatchSchema = z
  .object({
    kind: z.enum(DEFECT_KINDS, { error: "Choose what kind of defect it is." }).optional(),
    min: z
      .tuple([nonNegative("min x", 30_000), nonNegative("min y", 30_000), nonNegative("min z", 30_000)], {
        error: "min must be three numbers (x, y, z in mm).",
      })
      .optional(),
    max: z
      .tuple([positive("max x", 30_000), positive("max y", 30_000), positive("max z", 30_000)], {
        error: "max must be three numbers (x, y, z in mm).",
      })
      .optional(),
    /** Empty or null clears the note. */
    note: text("Note", 500).nullable().optional(),
  })
  .strict()
  .refine((d) => Object.keys(d).length > 0, { message: "Say what to change: kind, min, max or note." });
export type DefectPatch = z.infer<typeof defectPatchSchema>;

export const ledgerQuery = z.object({
  block: z.coerce.number().int().positive().optional(),
  kind: z.enum(LEDGER_KINDS).optional(),
  from: z.iso.date().optional(),
  to: z.iso.date().optional(),
  /** Keyset paging: entries older than this entry id (the `older` of the previous page). */
  before: z.coerce.number().int().positive().max(Number.MAX_SAFE_INTEGER).optional(),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(100),
});
