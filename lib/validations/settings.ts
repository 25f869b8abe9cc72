import { z } from "zod";

const mm = (label: string, min: number, max: number) =>
  z
    .number({ error: `${label} must be a number (mm).` })
    .finite()
    .min(min, `${label} must be at least ${min} mm.`)
    .max(max, `${label} must be at most ${max} mm.`);

/** Shop-wide defaults; every nesting run starts from these and may change them. */
export const shopSettingsSchema = z.object({
  shopName: z.string().trim().min(1, "Enter the shop's name.").max(120, "Use at most 120 characters."),
  displayUnits: z.enum(["mm", "in"], { error: "Choose mm or in." }),
  kerf: mm("Kerf", 0, 20),
  trim: mm("Face trim", 0, 100),
  defectMargin: mm("Defect margin", 0, 200),
  minOffcut: z.tuple([
    mm("Minimum offcut length", 1, 5000),
    mm("Minimum offcut width", 1, 5000),
    mm("Minimum offcut height", 1, 5000),
  ]),
  layout: z.enum(["guillotine", "layers", "free"], { error: "Choose guillotine, layers or free." }),
  feedMmPerMin: z
    .number({ error: "Feed rate must be a number." })
    .finite()
    .min(10, "Feed rate must be at least 10 mm/min.")
    .max(5000, "Feed rate must be at most 5000 mm/min."),
  nestingTimeLimitMs: z
    .number({ error: "Time limit must be a number." })
    .int("Use whole milliseconds.")
    .min(500, "At least 500 ms.")
    .max(120000, "At most 120000 ms."),
});

export type ShopSettings = z.infer<typeof shopSettingsSchema>;
