import { z } from "zod";

const num = (label: string, unit: string, min: number, max: number, exclusiveMin = false) =>
  z
    .number({ error: `${label} must be a number (${unit}).` })
    .finite(`${label} must be a number (${unit}).`)
    .refine(
      (v) => (exclusiveMin ? v > min : v >= min),
      `${label} must be ${exclusiveMin ? "more than" : "at least"} ${min} ${unit}.`,
    )
    .refine((v) => v <= max, `${label} must be at most ${max} ${unit}.`);

/** A program word such as M3, M64 P0 or M5: letters and numbers separated by single spaces. */
const code = (label: string) =>
  z
    .string()
    .trim()
    .max(20, `${label}: at most 20 characters.`)
    .regex(
      /^([A-Z]-?\d+(\.\d+)?)( [A-Z]-?\d+(\.\d+)?)*$/,
      `${label}: write program words such as M3 or M64 P0 (capital letter, number).`,
    )
    .nullable();

const axis = (label: string) =>
  z
    .string()
    .trim()
    .regex(/^[A-Z]$/, `${label}: one capital letter, such as X.`);

/** A cutter as the admin or planner enters it; mm, mm/min and seconds. */
export const machineSchema = z
  .object({
    name: z.string().trim().min(1, "Name the machine.").max(60, "Use at most 60 characters."),
    kind: z.enum(["block", "profile"], { error: "Choose block cutter or profile cutter." }),
    wire: z.enum(["horizontal", "vertical"], { error: "Choose a horizontal or an upright wire." }),
    wireLength: num("Wire length", "mm", 0, 10000, true),
    travel: z.tuple([num("Travel along X", "mm", 0, 20000, true), num("Travel along Y", "mm", 0, 20000, true)]),
    maxPiece: z.tuple([
      num("Largest piece: length", "mm", 0, 20000, true),
      num("Largest piece: width", "mm", 0, 20000, true),
      num("Largest piece: height", "mm", 0, 20000, true),
    ]),
    turntable: z.boolean({ error: "Say whether the machine has a turntable." }),
    rapid: num("Rapid rate", "mm/min", 10, 50000),
    heatUpS: num("Heat-up time", "s", 0, 600),
    handlingS: num("Handling time", "s", 0, 3600),
    dialect: z.object({
      unitWords: z.enum(["G20/G21", "G70/G71"], { error: "Choose G20/G21 or G70/G71." }),
      inch: z.boolean({ error: "Choose millimetres or inches." }),
      heatOn: code("Heat on"),
      heatOff: code("Heat off"),
      axes: z.tuple([axis("First axis letter"), axis("Second axis letter")]),
      /** A 4-axis cutter's second tower (e.g. U V); ignored on a 2-axis machine. */
      towerAxes: z
        .tuple([axis("Second tower, first axis letter"), axis("Second tower, second axis letter")])
        .nullable()
        .default(null),
      lineNumbers: z.boolean({ error: "Say whether lines are numbered." }),
    }),
    /** Two towers moving apart (tapered parts): a profile cutter only; the towers stand the wire length apart. */
    fourAxis: z.boolean({ error: "Say whether the machine cuts on 4 axes." }).default(false),
    active: z.boolean().default(true),
  })
  .superRefine((m, ctx) => {
    if ((m.dialect.heatOn === null) !== (m.dialect.heatOff === null))
      ctx.addIssue({
        code: "custom",
        path: ["dialect", m.dialect.heatOn === null ? "heatOn" : "heatOff"],
        message: "Give both heat codes, or neither when the heat is switched by hand.",
      });
    if (m.dialect.axes[0] === m.dialect.axes[1])
      ctx.addIssue({ code: "custom", path: ["dialect", "axes", 1], message: "The two axis letters must differ." });
    if (m.fourAxis) {
      if (m.kind !== "profile")
        ctx.addIssue({ code: "custom", path: ["fourAxis"], message: "Only a profile cutter cuts on 4 axes." });
      const tower = m.dialect.towerAxes;
      if (!tower)
        ctx.addIssue({
          code: "custom",
          path: ["dialect", "towerAxes", 0],
          message: "Give the second tower's two axis letters, such as U and V.",
        });
      else {
        const all = [...m.dialect.axes, ...tower];
        tower.forEach((a, i) => {
          if (all.indexOf(a) !== 2 + i)
            ctx.addIssue({
              code: "custom",
              path: ["dialect", "towerAxes", i],
              message: "The four axis letters must all differ.",
            });
        });
      }
    }
  });

export type MachineInput = z.infer<typeof machineSchema>;

/** Calibrated kerf and feed of one grade on one machine. */
export const machineGradesSchema = z.object({
  grades: z
    .array(
      z.object({
        gradeId: z.number({ error: "Choose a grade." }).int().positive("Choose a grade."),
        kerf: num("Kerf", "mm", 0, 20, true),
        feed: num("Feed", "mm/min", 10, 5000),
      }),
    )
    .max(100, "At most 100 grades."),
});
