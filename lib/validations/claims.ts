import { z } from "zod";
import { CLAIM_REASONS, HOLD_REASONS } from "@/lib/stock";

const text = (label: string, max: number) =>
  z
    .string({ error: `${label} must be text.` })
    .trim()
    .max(max, `${label}: at most ${max} characters.`);
const optionalText = (label: string, max = 500) =>
  text(label, max)
    .optional()
    .nullable()
    .transform((v) => (v ? v : null));
const money = (label: string) =>
  z
    .number({ error: `${label} must be a number.` })
    .finite(`${label} must be a number.`)
    .min(0, `${label} cannot be negative.`)
    .max(10_000_000, `${label} must be at most 10,000,000.`);

/** `POST /api/blocks/12/hold` */
export const holdSchema = z.object({
  reason: z.enum(HOLD_REASONS, {
    error: "Choose why: under density, over density, wet, damaged or awaiting re-weigh.",
  }),
  note: optionalText("Note", 300),
});
export type HoldInput = z.infer<typeof holdSchema>;

/** `POST /api/blocks/12/release`: the new weight when it was weighed again. */
export const releaseSchema = z.object({
  weightKg: z
    .number({ error: "Weight must be a number (kg)." })
    .finite("Weight must be a number (kg).")
    .gt(0, "Weight must be more than 0 kg.")
    .max(10_000, "Weight must be at most 10,000 kg.")
    .optional()
    .nullable()
    .transform((v) => v ?? null),
  note: optionalText("Note", 300),
});
export type ReleaseInput = z.infer<typeof releaseSchema>;

/** `POST /api/claims`: the blocks by code; the supplier is the one that delivered them. */
export const claimSchema = z.object({
  supplierId: z
    .number({ error: "Choose a supplier." })
    .int("Choose a supplier.")
    .positive("Choose a supplier.")
    .optional(),
  reason: z.enum(CLAIM_REASONS, {
    error: "Choose the reason: under density, over density, wet, damaged, wrong size or other.",
  }),
  note: optionalText("Note", 1000),
  creditAsked: money("Credit asked"),
  blocks: z
    .array(text("Block code", 60).min(1, "Enter a block code."), { error: "List the blocks claimed for." })
    .min(1, "List at least one block claimed for.")
    .max(200, "At most 200 blocks in one claim."),
});
export type ClaimInput = z.infer<typeof claimSchema>;

/** `POST /api/claims/3/decide`: the supplier's answer. */
export const claimDecisionSchema = z
  .object({
    outcome: z.enum(["accepted", "rejected", "credited"], {
      error: "Choose the supplier's answer: accepted, rejected or credited.",
    }),
    creditReceived: money("Credit received").optional().nullable(),
    note: optionalText("Note", 1000),
  })
  .superRefine((d, ctx) => {
    if (d.outcome === "credited" && (d.creditReceived === undefined || d.creditReceived === null))
      ctx.addIssue({ code: "custom", path: ["creditReceived"], message: "Enter the credit received." });
    if (d.outcome === "rejected" && d.creditReceived)
      ctx.addIssue({
        code: "custom",
        path: ["creditReceived"],
        message: "A rejected claim brings no credit: leave credit received empty.",
      });
  });
export type ClaimDecisionInput = z.infer<typeof claimDecisionSchema>;
