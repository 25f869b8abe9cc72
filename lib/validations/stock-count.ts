import { z } from "zod";
import { sizeSchema } from "./stock";

const code = z
  .string({ error: "A block code must be text." })
  .trim()
  .min(1, "Enter the block code from its label.")
  .max(40, "A block code has at most 40 characters.");

const place = (label: string) =>
  z
    .string({ error: `${label} must be text.` })
    .trim()
    .max(60, `${label}: at most 60 characters.`)
    .nullable()
    .optional()
    .transform((v) => (v ? v : null));

/** The most blocks one count takes (a yard's worth; the CSV count takes more). */
export const MAX_COUNTED = 5000;

/**
 * A count by scanning: the place counted (none: the whole yard), each block counted with where it
 * was found (none: the place counted, else where the register has it) and its measured size when
 * someone measured it, and, to commit, the blocks the person confirmed as not found.
 */
export const scanCountSchema = z
  .object({
    location: place("Location"),
    counted: z
      .array(
        z
          .object({
            code,
            location: place("Where it was found"),
            size: sizeSchema.nullable().optional(),
          })
          .strict(),
        { error: "List the blocks counted." },
      )
      .max(MAX_COUNTED, `At most ${MAX_COUNTED} blocks in one count.`),
    missing: z.array(code, { error: "List the blocks not found." }).max(50_000).optional(),
  })
  .strict()
  .superRefine((v, ctx) => {
    if (!v.location && v.counted.length === 0)
      ctx.addIssue({
        code: "custom",
        path: ["counted"],
        message:
          "Count at least one block: a count of the whole yard with nothing counted would write off every block.",
      });
  });
export type ScanCountInput = z.infer<typeof scanCountSchema>;

export const countCheckSchema = z.object({ code });
