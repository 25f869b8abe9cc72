import { z } from "zod";
import { receivedBlockSchema, sizeSchema } from "@/lib/validations/stock";

const text = (label: string, max = 200) =>
  z
    .string({ error: `${label} must be text.` })
    .trim()
    .max(max, `${label}: at most ${max} characters.`);
const optionalText = (label: string, max = 500) =>
  text(label, max)
    .optional()
    .nullable()
    .transform((v) => (v ? v : null));
const date = (label: string) => z.iso.date({ error: `${label} must be a date (YYYY-MM-DD).` });
const id = (what: string) =>
  z
    .number({ error: `Choose ${what}.` })
    .int(`Choose ${what}.`)
    .positive(`Choose ${what}.`);
const num = (label: string, min: number, max: number, opts: { gt?: boolean } = {}) => {
  const n = z.number({ error: `${label} must be a number.` }).finite(`${label} must be a number.`);
  return (
    opts.gt ? n.gt(min, `${label} must be more than ${min}.`) : n.min(min, `${label} must be at least ${min}.`)
  ).max(max, `${label} must be at most ${max}.`);
};

export const workingDaysSchema = z
  .array(
    z
      .number({ error: "Working days are weekdays 1 (Monday) to 7 (Sunday)." })
      .int("Working days are weekdays 1 (Monday) to 7 (Sunday).")
      .min(1, "Working days are weekdays 1 (Monday) to 7 (Sunday).")
      .max(7, "Working days are weekdays 1 (Monday) to 7 (Sunday)."),
    { error: "Choose the working days." },
  )
  .min(1, "Choose at least one working day.")
  .max(7)
  .transform((d) => [...new Set(d)].sort((a, b) => a - b));

export const serviceLevel = num("Service level", 0.5, 0.999, { gt: true });

/** The shop's reorder defaults. */
export const reorderSettingsSchema = z.object({
  serviceLevel,
  historyDays: z
    .number({ error: "History must be a number of days." })
    .int("History must be whole days.")
    .min(7, "Use at least 7 days of history.")
    .max(730, "At most 730 days."),
  orderCost: num("Order cost", 0, 100_000),
  holdingCost: num("Holding cost", 0, 100_000, { gt: true }),
  /** The shop calendar: ISO weekdays that are working days (1 Monday … 7 Sunday). Left out: unchanged. */
  workingDays: workingDaysSchema.optional(),
});
export type ReorderSettingsInput = z.infer<typeof reorderSettingsSchema>;
export type ReorderSettings = Omit<ReorderSettingsInput, "workingDays"> & { workingDays: number[] };

/** A grade's overrides: null (or left out) means "work it out". */
export const gradeReorderSchema = z.object({
  supplierId: id("a supplier").nullable().optional(),
  leadTimeDays: z
    .number({ error: "Lead time must be a number." })
    .int("Lead time must be whole working days.")
    .min(0, "Lead time cannot be negative.")
    .max(365, "At most 365 working days.")
    .nullable()
    .optional(),
  serviceLevel: serviceLevel.nullable().optional(),
  dailyDemandM3: num("Daily demand", 0, 1000).nullable().optional(),
  demandSdM3: num("Daily demand's standard deviation", 0, 1000).nullable().optional(),
  orderCost: num("Order cost", 0, 100_000).nullable().optional(),
  holdingCost: num("Holding cost", 0, 100_000, { gt: true }).nullable().optional(),
  reorderPointM3: num("Reorder point", 0, 100_000).nullable().optional(),
  orderQtyM3: num("Order quantity", 0, 100_000, { gt: true }).nullable().optional(),
  note: optionalText("Note"),
});
export type GradeReorderInput = z.infer<typeof gradeReorderSchema>;

export const draftFromReorderSchema = z.object({
  gradeIds: z
    .array(id("a grade"), { error: "Choose the grades to order." })
    .min(1, "Tick at least one grade.")
    .max(100),
  expectedOn: date("Expected date").nullable().optional(),
});

export const poLineSchema = z.object({
  gradeId: id("a grade"),
  size: sizeSchema,
  quantity: z
    .number({ error: "Quantity must be a number of blocks." })
    .int("Quantity must be whole blocks.")
    .min(1, "Order at least 1 block.")
    .max(10_000, "At most 10,000 blocks per line."),
  price: num("Price", 0, 1_000_000),
  note: optionalText("Note"),
});

export const purchaseOrderSchema = z.object({
  supplierId: id("a supplier"),
  expectedOn: date("Expected date").nullable().optional(),
  notes: optionalText("Notes", 1000),
  lines: z
    .array(poLineSchema, { error: "Add the lines to order." })
    .min(1, "Add at least one line.")
    .max(100, "At most 100 lines per order."),
});
export type PurchaseOrderInput = z.infer<typeof purchaseOrderSchema>;

export const sendPoSchema = z.object({
  /** false: the order went another way (phone, portal); only mark it sent. */
  email: z.boolean({ error: "Say whether to e-mail the order." }).default(true),
});

export const cancelPoSchema = z.object({ reason: text("Reason", 300).min(1, "Say why the order is cancelled.") });
export const closePoSchema = z.object({ reason: text("Reason", 300).min(1, "Say why the order is closed short.") });

export const receivePoSchema = z
  .object({
    receivedOn: date("Received on"),
    lot: text("Lot", 60).min(1, "Enter lot."),
    notes: optionalText("Notes"),
    acceptOver: z.boolean().optional().default(false),
    overReason: optionalText("Reason for taking more", 300),
    blocks: z
      .array(
        receivedBlockSchema.omit({ gradeId: true, cost: true, nominalSize: true }).extend({
          lineId: id("the order line"),
          cost: num("Cost", 0, 10_000_000).nullable().optional(),
        }),
        { error: "Add the blocks that came." },
      )
      .min(1, "Add at least one block.")
      .max(500, "At most 500 blocks per delivery."),
  })
  .refine((r) => !r.acceptOver || r.overReason, {
    path: ["overReason"],
    message: "Say why the extra quantity is accepted.",
  });
export type ReceivePoInput = z.infer<typeof receivePoSchema>;

export const periodSchema = z
  .object({
    from: z.iso.date({ error: "from must be a date (YYYY-MM-DD)." }).optional(),
    to: z.iso.date({ error: "to must be a date (YYYY-MM-DD)." }).optional(),
    format: z.enum(["json", "csv"], { error: "format is json or csv." }).default("json"),
  })
  .refine((p) => !p.from || !p.to || p.from <= p.to, { path: ["to"], message: "to must not be before from." });
