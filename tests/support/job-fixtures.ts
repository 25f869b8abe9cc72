import { testDb } from "./db";

let seq = 0;

/** A job straight in the database (status open unless asked), for tests that need one to act on. */
export async function makeJob(
  opts: { status?: "open" | "planned" | "cutting" | "done" | "cancelled"; name?: string } = {},
): Promise<number> {
  const [j] = await testDb()("jobs")
    .insert({
      name: opts.name ?? `Test job ${process.pid}-${++seq}`,
      customer: "Test customer",
      due_on: "2026-12-24",
      status: opts.status ?? "open",
    })
    .returning("id");
  return j!.id as number;
}

/** A plain box part on a job. */
export async function makeJobPart(
  jobId: number,
  opts: { quantity?: number; size?: [number, number, number] } = {},
): Promise<number> {
  const size = opts.size ?? [600, 300, 50];
  const [p] = await testDb()("job_parts")
    .insert({
      job_id: jobId,
      name: `Test part ${++seq}`,
      quantity: opts.quantity ?? 2,
      size_x: size[0],
      size_y: size[1],
      size_z: size[2],
      rotate: "any",
    })
    .returning("id");
  return p!.id as number;
}

/** A library part (a plain box) straight in the database. */
export async function makeLibraryPart(opts: { active?: boolean } = {}): Promise<number> {
  const [l] = await testDb()("library_parts")
    .insert({
      kit: "Test kit",
      name: `Test library part ${++seq}`,
      size_x: 400,
      size_y: 200,
      size_z: 30,
      rotate: "any",
      active: opts.active ?? true,
    })
    .returning("id");
  return l!.id as number;
}
