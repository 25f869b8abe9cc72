import { z } from "zod";

const mm = (label: string, min: number, max: number) =>
  z
    .number({ error: `${label} must be a number (mm).` })
    .finite()
    .min(min, `${label} must be at least ${min} mm.`)
    .max(max, `${label} must be at most ${max} mm.`);

/** The nesting time budget people may give a run, in seconds. */
export const BUDGET_S = { min: 0.5, max: 120 } as const;

/** Seconds typed in a form → whole milliseconds for the API; null (left empty) stays null for the API to name. */
export const secondsToMs = (s: number | null): number | null => (s === null ? null : Math.round(s * 1000));

export const runSettingsSchema = z.object({
  kerf: mm("Kerf", 0, 20),
  trim: mm("Face trim", 0, 100),
  defectMargin: mm("Defect margin", 0, 200),
  minOffcut: z.tuple([
    mm("Minimum offcut length", 1, 5000),
    mm("Minimum offcut width", 1, 5000),
    mm("Minimum offcut height", 1, 5000),
  ]),
  layout: z.enum(["guillotine", "layers", "free"], { error: "Choose guillotine, layers or free." }),
  /** Milliseconds in the API; people type seconds (BUDGET_S), the form converts. */
  timeLimitMs: z
    .number({ error: `Time budget must be a number: ${BUDGET_S.min} to ${BUDGET_S.max} seconds.` })
    .int("Time budget must be a whole number of milliseconds.")
    .min(BUDGET_S.min * 1000, `Time budget must be at least ${BUDGET_S.min} s.`)
    .max(BUDGET_S.max * 1000, `Time budget must be at most ${BUDGET_S.max} s.`),
  /**
   * Nest profile parts by their true shape in slabs (plan version 2); the worker also nests the
   * same parts as boxes and stores both figures. Absent: false.
   */
  trueShape: z.boolean({ error: "True-shape nesting is on (true) or off (false)." }).optional(),
});
export type RunSettings = z.infer<typeof runSettingsSchema>;

export const createRunSchema = z.object({
  jobIds: z
    .array(z.number().int().positive(), { error: "Choose at least one job." })
    .min(1, "Choose at least one job.")
    .max(50),
  blockIds: z
    .array(z.number().int().positive(), { error: "Choose the stock to plan into." })
    .min(1, "Choose at least one block or offcut.")
    .max(2000),
  settings: runSettingsSchema,
  /** The block cutter the plan is made for: its calibrated kerf for the grades involved replaces settings.kerf. */
  machineId: z.number({ error: "Choose a machine." }).int().positive("Choose a machine.").nullable().optional(),
});
export type CreateRunInput = z.infer<typeof createRunSchema>;

export const recordCutSchema = z.object({
  rejects: z
    .array(
      z.object({
        jobPartId: z.number({ error: "Which part?" }).int().positive(),
        count: z.number({ error: "How many?" }).int().min(1, "At least 1.").max(10_000),
        reason: z.string({ error: "Say why." }).trim().min(1, "Say why it was rejected.").max(300),
      }),
    )
    .max(500)
    .default([]),
  note: z.string().trim().max(500).optional().nullable(),
  /** Finishing a block takes the cutter's confirmation: the block leaves stock and its offcuts enter it. */
  confirm: z.literal(true, { error: "Confirm that the whole block is cut (confirm: true)." }),
  /** Part-cut: only the steps checked off are recorded; the uncut pieces go back to stock. */
  partial: z.boolean({ error: "partial is true or false." }).optional(),
});
export type RecordCutInput = z.infer<typeof recordCutSchema>;
