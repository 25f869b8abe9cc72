import { z } from "zod";
import { JOB_STATUSES, ROTATE_RULES } from "@/lib/job-terms";
import { checkOutline, checkPolygon, parseNaca } from "@/lib/profiles";
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
const mm = (label: string, max = 30_000) =>
  z
    .number({ error: `${label} must be a number.` })
    .finite(`${label} must be a number.`)
    .gt(0, `${label} must be more than 0.`)
    // Sizes are kept to 0.01 mm: a smaller one would be stored as 0.
    .min(MIN_SIZE_MM, `${label} must be at least ${MIN_SIZE_MM} mm (sizes are kept to 0.01 mm).`)
    .max(max, `${label} must be at most ${max} mm.`);
const quantity = z
  .number({ error: "Quantity must be a number." })
  .int("Quantity must be a whole number.")
  .min(1, "Quantity must be at least 1.")
  .max(100_000, "Quantity must be at most 100,000.");
const id = (what: string) =>
  z
    .number({ error: `Choose ${what}.` })
    .int()
    .positive(`Choose ${what}.`);

export const sizeSchema = z.tuple([mm("Length"), mm("Width"), mm("Height")], {
  error: "Give the size as [length, width, height] in mm.",
});

const coordinate = z.number({ error: "Each coordinate must be a number." }).finite().min(-30_000).max(30_000);
const loopSchema = z.array(z.tuple([coordinate, coordinate]), {
  error: "Give the outline as a list of [x, y] points.",
});

export const polygonProfileSchema = z
  .object({
    kind: z.literal("polygon"),
    points: loopSchema.max(2_000, "At most 2,000 points.").superRefine((pts, ctx) => {
      const problem = checkPolygon(pts);
      if (problem) ctx.addIssue({ code: "custom", message: problem });
    }),
    holes: z
      .array(loopSchema.max(2_000, "At most 2,000 points per hole."), {
        error: "Give the holes as a list of outlines.",
      })
      .max(200, "At most 200 holes.")
      .optional(),
    source: z.string().trim().max(200, "The source is at most 200 characters.").optional(),
    extrudeMm: mm("Extrusion length"),
  })
  .superRefine((p, ctx) => {
    if (!p.holes?.length) return;
    const problem = checkOutline(p.points, p.holes);
    if (problem) ctx.addIssue({ code: "custom", path: ["holes"], message: problem });
  });

export const nacaProfileSchema = z.object({
  kind: z.literal("naca"),
  code: z
    .string({ error: "Enter a NACA code." })
    .superRefine((v, ctx) => {
      try {
        parseNaca(v);
      } catch (e) {
        ctx.addIssue({ code: "custom", message: (e as Error).message });
      }
    })
    .transform((v) => parseNaca(v).code),
  chordMm: mm("Root chord", 10_000),
  tipChordMm: mm("Tip chord", 10_000).nullable().optional(),
  spanMm: mm("Span"),
  sweepMm: z
    .number({ error: "Sweep must be a number." })
    .finite()
    .min(-10_000, "Sweep must be at least -10,000 mm.")
    .max(10_000, "Sweep must be at most 10,000 mm.")
    .nullable()
    .optional(),
});

export const profileSchema = z.discriminatedUnion("kind", [polygonProfileSchema, nacaProfileSchema], {
  error: "The profile is a polygon or a NACA section.",
});
export type ProfileInput = z.infer<typeof profileSchema>;

/** A part as the planner enters it: a plain box (size) or a profile (the box is then computed). */
export const partSchema = z
  .object({
    name: required("Name", 120),
    quantity,
    size: sizeSchema.nullable().optional(),
    profile: profileSchema.nullable().optional(),
    gradeId: id("a grade").nullable().optional(),
    rotate: z.enum(ROTATE_RULES, { error: "Rotation is any, z or none." }).default("any"),
  })
  .superRefine((p, ctx) => {
    if (!p.profile && !p.size)
      ctx.addIssue({ code: "custom", path: ["size"], message: "Give a size, or a profile to compute it from." });
  });
export type PartInput = z.infer<typeof partSchema>;

/** Several parts at once (the profiles of one drawing, the letters of a word): added all or none. */
export const partsSchema = z.object({
  parts: z
    .array(partSchema, { error: "Send the parts as a list." })
    .min(1, "Send at least one part.")
    .max(200, "At most 200 parts at once."),
});

export const libraryPartSchema = z
  .object({
    kit: optionalText("Kit", 120),
    name: required("Name", 120),
    size: sizeSchema.nullable().optional(),
    profile: profileSchema.nullable().optional(),
    gradeId: id("a grade").nullable().optional(),
    rotate: z.enum(ROTATE_RULES, { error: "Rotation is any, z or none." }).default("any"),
    defaultQuantity: quantity.default(1),
    notes: optionalText("Notes"),
    active: z.boolean({ error: "Must be true or false." }).optional(),
  })
  .superRefine((p, ctx) => {
    if (!p.profile && !p.size)
      ctx.addIssue({ code: "custom", path: ["size"], message: "Give a size, or a profile to compute it from." });
  });
export type LibraryPartInput = z.infer<typeof libraryPartSchema>;

/** Several library parts at once (the profiles of one drawing, the letters of a word): all or none. */
export const libraryPartsSchema = z.object({
  parts: z
    .array(libraryPartSchema, { error: "Send the parts as a list." })
    .min(1, "Send at least one part.")
    .max(200, "At most 200 parts at once."),
});

export const libraryPatchSchema = z
  .object({
    kit: optionalText("Kit", 120).optional(),
    name: required("Name", 120).optional(),
    size: sizeSchema.nullable().optional(),
    profile: profileSchema.nullable().optional(),
    gradeId: id("a grade").nullable().optional(),
    rotate: z.enum(ROTATE_RULES, { error: "Rotation is any, z or none." }).optional(),
    defaultQuantity: quantity.optional(),
    notes: optionalText("Notes").optional(),
    active: z.boolean({ error: "Must be true or false." }).optional(),
  })
  .strict();
export type LibraryPatch = z.infer<typeof libraryPatchSchema>;

export const fromLibrarySchema = z.object({
  items: z
    .array(z.object({ libraryPartId: id("a library part"), quantity }))
    .min(1, "Choose at least one library part.")
    .max(500, "At most 500 library parts at once."),
});

export const jobSchema = z.object({
  name: required("Job name", 120),
  customer: optionalText("Customer or project", 120),
  dueOn: z.iso.date({ error: "Due date must be a date (YYYY-MM-DD)." }).nullable().optional(),
  notes: optionalText("Notes", 1000),
});
export type JobInput = z.infer<typeof jobSchema>;

export const jobPatchSchema = z
  .object({
    name: required("Job name", 120).optional(),
    customer: optionalText("Customer or project", 120).optional(),
    dueOn: z.iso.date({ error: "Due date must be a date (YYYY-MM-DD)." }).nullable().optional(),
    notes: optionalText("Notes", 1000).optional(),
    status: z.enum(JOB_STATUSES, { error: "Status is open, planned, cutting, done or cancelled." }).optional(),
  })
  .strict();
export type JobPatch = z.infer<typeof jobPatchSchema>;

export const jobPartPatchSchema = z
  .object({
    quantity: quantity.optional(),
    name: required("Name", 120).optional(),
    gradeId: id("a grade").nullable().optional(),
    rotate: z.enum(ROTATE_RULES, { error: "Rotation is any, z or none." }).optional(),
  })
  .strict();
export type JobPartPatch = z.infer<typeof jobPartPatchSchema>;

export const jobQuerySchema = z.object({
  status: z
    .enum([...JOB_STATUSES, "active", "all"] as const, {
      error: "Status is open, planned, cutting, done, cancelled, active or all.",
    })
    .default("active"),
  q: z.string().trim().max(60).optional(),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
});
export type JobQuery = z.infer<typeof jobQuerySchema>;

export const libraryQuerySchema = z.object({
  kit: z.string().trim().max(120).optional(),
  /** Words to find in a part's name, its kit or its grade code. */
  q: z.string().trim().max(120, "Search: at most 120 characters.").optional(),
  includeRetired: z.enum(["0", "1"]).optional(),
});
