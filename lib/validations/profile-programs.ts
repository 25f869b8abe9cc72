import { z } from "zod";

const point = (label: string) =>
  z
    .string()
    .trim()
    .regex(
      /^-?\d+(\.\d+)?\s*,\s*-?\d+(\.\d+)?$/,
      `${label}: write it as "x,y" in mm from the part's lower left corner.`,
    )
    .transform((s) => s.split(",").map((v) => Number(v.trim())) as [number, number]);

/**
 * The query of a program download: which profile cutter, G-code or the drawing, and the
 * planner's choices (way round, dwell at sharp corners; for one part, lead-in and slit points).
 *
 *   programQuerySchema.parse({ format: "svg", dwell: "0.5", leadIn: "0,20" })
 *   // → { format: "svg", dwell: 0.5, dwellAngle: 45, leadIn: [0, 20], … }
 */
export const programQuerySchema = z.object({
  machineId: z.coerce
    .number({ error: "machineId: the id of a profile cutter, e.g. machineId=2." })
    .int("machineId: the id of a profile cutter, e.g. machineId=2.")
    .positive("machineId: the id of a profile cutter, e.g. machineId=2.")
    .optional(),
  format: z.enum(["gcode", "svg"], { error: "format: gcode (the program) or svg (its drawing)." }).default("gcode"),
  direction: z.enum(["cw", "ccw"], { error: "direction: cw (clockwise) or ccw (anticlockwise)." }).optional(),
  dwell: z.coerce
    .number({ error: "dwell: seconds to wait at a sharp corner, 0 to 10." })
    .min(0, "dwell: seconds to wait at a sharp corner, 0 to 10.")
    .max(10, "dwell: seconds to wait at a sharp corner, 0 to 10.")
    .optional(),
  dwellAngle: z.coerce
    .number({ error: "dwellAngle: the least turn of a corner that gets a dwell, 5 to 175 degrees." })
    .min(5, "dwellAngle: the least turn of a corner that gets a dwell, 5 to 175 degrees.")
    .max(175, "dwellAngle: the least turn of a corner that gets a dwell, 5 to 175 degrees.")
    .default(45),
  leadIn: point("leadIn").optional(),
  /** Slit points per hole, "x,y;x,y" in hole order; an empty place keeps the shortest slit. */
  slits: z
    .string()
    .max(2000, "slits: at most 2000 characters.")
    .transform((s, ctx) =>
      s.split(";").map((p, i) => {
        if (!p.trim()) return null;
        const r = point(`slits, hole ${i + 1}`).safeParse(p);
        if (!r.success) {
          ctx.addIssue({ code: "custom", message: r.error.issues[0]!.message });
          return null;
        }
        return r.data;
      }),
    )
    .optional(),
  zRoot: z.coerce
    .number({ error: "zRoot: mm from the first tower to the root face." })
    .min(0, "zRoot: mm from the first tower to the root face.")
    .max(20000, "zRoot: mm from the first tower to the root face.")
    .optional(),
  slab: z.string().max(60, "slab: a slab's name such as HF-1001 slab 1.").optional(),
});

export type ProgramQuery = z.infer<typeof programQuerySchema>;
