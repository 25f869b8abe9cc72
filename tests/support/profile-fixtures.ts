import { partGeometry, type Profile } from "@/lib/profiles";
import { testDb } from "./db";
import { makeDoneRun } from "./planning-fixtures";
import { makeBlock } from "./db";

let seq = 0;

/** A sign letter with a counter (a frame, mm in the cutting plane) and a tapered, swept wing panel. */
export const LETTER_O: Profile = {
  kind: "polygon",
  points: [
    [0, 0],
    [120, 0],
    [120, 160],
    [0, 160],
  ],
  holes: [
    [
      [30, 30],
      [90, 30],
      [90, 130],
      [30, 130],
    ],
  ],
  extrudeMm: 50,
};
export const WING: Profile = { kind: "naca", code: "2412", chordMm: 220, tipChordMm: 150, spanMm: 450, sweepMm: 30 };

/** A part with a profile on a job, its box and true volume worked out as the app does. */
export async function makeProfilePart(
  jobId: number,
  profile: Profile,
  opts: { name?: string; quantity?: number; gradeCode?: string } = {},
): Promise<number> {
  const g = partGeometry(profile);
  const grade = opts.gradeCode ? await testDb()("grades").where({ code: opts.gradeCode }).first("id") : undefined;
  const [p] = await testDb()("job_parts")
    .insert({
      job_id: jobId,
      name: opts.name ?? `Profile part ${process.pid}-${++seq}`,
      quantity: opts.quantity ?? 1,
      size_x: g.size[0],
      size_y: g.size[1],
      size_z: g.size[2],
      grade_id: grade?.id ?? null,
      rotate: "none",
      profile: JSON.stringify(profile),
      true_volume_mm3: g.trueVolumeMm3,
    })
    .returning("id");
  return p!.id as number;
}

/** A job of profile parts (letters and a wing panel), planned into one fresh block with the real solver. */
export async function makeProfileRun() {
  const [job] = await testDb()("jobs")
    .insert({ name: `Profile job ${process.pid}-${++seq}`, customer: "Test", status: "open" })
    .returning("id");
  const letter = await makeProfilePart(job!.id, LETTER_O, { name: "Letter O", quantity: 3, gradeCode: "EPS-II" });
  const wing = await makeProfilePart(job!.id, WING, { name: "Wing panel", quantity: 1, gradeCode: "EPS-II" });
  const block = await makeBlock({ size: [1000, 600, 400] });
  const run = await makeDoneRun(job!.id, [block]);
  return { jobId: job!.id as number, letter, wing, block, ...run };
}

/** The demo shop's profile cutter (seeded: 4-axis, X Y U V). */
export async function profileCutterId(): Promise<number> {
  const m = await testDb()("machines").where({ kind: "profile" }).orderBy("id").first("id");
  return m!.id;
}
