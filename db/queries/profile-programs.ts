import "server-only";
import { db } from "@/db";
import { HttpError } from "@/lib/errors";
import type { Plan, Problem, SlabLayout, Vec3 } from "@/lib/nesting";
import { slabMaxFor } from "@/lib/planning/machine";
import { partIdFromKey } from "@/lib/planning/problem";
import type { Profile } from "@/lib/profiles";
import { FourAxisError } from "@/lib/profiles/four-axis";
import { type ProfileProgram, type ProgramPart, ProgramError, profileProgram } from "@/lib/profiles/program";
import { orientation, partSections, planSlabs, type Slab } from "@/lib/profiles/slabs";
import { layerProgram, slabProgramInput, slabProgramParts } from "@/lib/profiles/slab-program";
import { type Dwell, ToolpathError } from "@/lib/profiles/toolpath";
import type { Point } from "@/lib/profiles/polygon";
import { getMachine, kerfAndFeed, listMachines, type StoredMachine } from "./machines";
import { getShopSettings } from "./settings";

/** What the planner may choose for a program: the way round, dwells, and (one part) where the lead-in and slits go. */
export interface ProgramChoices {
  direction?: "cw" | "ccw";
  dwell?: Dwell | null;
  /** One part only: lead-in point and slit points per hole, in the part's own frame (mm from its box corner). */
  leadIn?: Point | null;
  slits?: (Point | null)[];
  /** 4-axis: the first tower to the root face, mm. */
  zRoot?: number | null;
}

/**
 * The profile cutter a program is made for: the one asked for, else the shop's first active
 * profile cutter. A 404 for no such machine, a 409 naming the machine when it is a block cutter
 * or when the shop has no profile cutter.
 */
export async function profileMachine(machineId?: number | null): Promise<StoredMachine> {
  if (machineId) {
    const m = await getMachine(machineId);
    if (!m) throw new HttpError(404, "That machine was not found.");
    if (m.kind !== "profile")
      throw new HttpError(409, `${m.name} is a block cutter: profiles are cut on a profile cutter. Choose one.`);
    return m;
  }
  const m = (await listMachines({ activeOnly: true })).find((x) => x.kind === "profile");
  if (!m) throw new HttpError(409, "The shop has no profile cutter: add one on the Machines page.");
  return m;
}

/** Kerf and feed of a grade (by id; null: any grade) on a machine: calibrated, else the shop's defaults. */
async function kerfFeed(machine: StoredMachine, gradeId: number | null): Promise<{ kerf: number; feed: number }> {
  const s = await getShopSettings();
  const kf = kerfAndFeed(machine, gradeId === null ? [] : [gradeId], { kerf: s.kerf, feed: s.feedMmPerMin });
  return { kerf: kf.kerf, feed: kf.feedByGrade.values().next().value! };
}

/** A program error as an answer: 409 naming the limit (the machine cannot), 422 for the profile itself. */
function asHttp(e: unknown): never {
  if (e instanceof ProgramError || e instanceof FourAxisError) throw new HttpError(409, e.message);
  if (e instanceof ToolpathError) throw new HttpError(422, e.message);
  throw e;
}

export interface PartProgram {
  program: ProfileProgram;
  machine: StoredMachine;
  /** File name without extension: "job-3-part-12-wing-panel". */
  name: string;
}

/**
 * The program of one part of a job on a profile cutter: its blank (the part's box) alone on the
 * table. 404 when the part is not in that job, 409 when it has no profile or the machine cannot cut it.
 */
export async function partProgram(
  jobId: number,
  partId: number,
  machineId: number | null,
  choices: ProgramChoices = {},
): Promise<PartProgram> {
  const row = await db()("job_parts as p")
    .leftJoin("grades as g", "g.id", "p.grade_id")
    .where({ "p.id": partId, "p.job_id": jobId })
    .first("p.id", "p.name", "p.profile", "p.size_x", "p.size_y", "p.size_z", "p.grade_id", "g.code as grade_code");
  if (!row) throw new HttpError(404, "That part was not found in this job.");
  const profile = row.profile as Profile | null;
  if (!profile)
    throw new HttpError(
      409,
      `${row.name} is a plain box: it has no profile to cut. Give it a drawing, a point list or a NACA section first.`,
    );
  const machine = await profileMachine(machineId);
  const { kerf, feed } = await kerfFeed(machine, row.grade_id);
  const s = partSections(profile);
  const size: Vec3 = [Number(row.size_x), Number(row.size_y), Number(row.size_z)];
  const part: ProgramPart = { name: row.name, ...s, leadIn: choices.leadIn ?? null, slits: choices.slits };
  try {
    const program = profileProgram(
      {
        title: `part ${row.name}, job ${jobId}`,
        size: [size[1], size[2]],
        thickness: size[0],
        parts: [part],
        kerf,
        feed,
        grade: row.grade_code ?? null,
        direction: choices.direction,
        dwell: choices.dwell,
        zRoot: choices.zRoot,
      },
      machine,
    );
    return { program, machine, name: `job-${jobId}-part-${partId}-${slug(row.name)}` };
  } catch (e) {
    return asHttp(e);
  }
}

const slug = (s: string) =>
  s
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-|-$/g, "")
    .slice(0, 40) || "part";

export interface SlabProgram {
  slab: Slab;
  /** "HF-1001 slab 1" */
  label: string;
  /** Null when the machine cannot cut the slab (see `problem`) or the program was not worked out (a large plan on a page). */
  program: ProfileProgram | null;
  /** Why there is no program (the machine cannot cut this slab), else null. */
  problem: string | null;
  names: string[];
}

/** Past this many profile parts in a plan, pages list its slabs without working out every program (seconds). */
export const PROFILE_PAGE_LIMIT = 40;

/** The profiles of a plan's parts by plan key ("jp-12"), with their boxes and names. */
async function profilesOf(
  problem: Problem,
): Promise<Map<string, { name: string; size: Vec3; profile: Profile | null }>> {
  const ids = (problem.parts ?? []).map((p) => partIdFromKey(p.id));
  const rows = ids.length
    ? await db()("job_parts").whereIn("id", ids).select("id", "name", "profile", "size_x", "size_y", "size_z")
    : [];
  return new Map(
    rows.map((r) => [
      `jp-${r.id}`,
      {
        name: r.name,
        size: [Number(r.size_x), Number(r.size_y), Number(r.size_z)] as Vec3,
        profile: (r.profile as Profile | null) ?? null,
      },
    ]),
  );
}

/**
 * The slabs of a true-shape plan (placements carrying `slab`) as the slab list shows them: one per
 * slab placement, numbered after the box-nested slabs of its block, its members' sections where the
 * slab's face holds them (the program itself is made from the layout by `slabProgramInput`).
 */
function trueShapeSlabs(plan: Plan, problem: Problem, boxSlabs: readonly Slab[]): { slab: Slab; layout: SlabLayout }[] {
  const out: { slab: Slab; layout: SlabLayout }[] = [];
  const n = new Map<string, number>();
  for (const s of boxSlabs) n.set(s.block, Math.max(n.get(s.block) ?? 0, s.n));
  const partsById = new Map(problem.parts.map((p) => [p.id, p]));
  const AXI = { x: 0, y: 1, z: 2 } as const;
  plan.placements.forEach((pl, index) => {
    if (!pl.slab) return;
    const o = orientation(pl.slab.size, pl.size);
    const w = AXI[o.wire];
    const face = slabProgramParts(pl.slab, partsById, (id) => id);
    const k = (n.get(pl.block) ?? 0) + 1;
    n.set(pl.block, k);
    out.push({
      layout: pl.slab,
      slab: {
        block: pl.block,
        n: k,
        wire: o.wire,
        plane: o.plane,
        along: [pl.origin[w], pl.origin[w] + pl.size[w]],
        origin: [pl.origin[AXI[o.plane[0]]], pl.origin[AXI[o.plane[1]]]],
        size: [pl.slab.size[1], pl.slab.size[2]],
        parts: pl.slab.members.map((m, i) => {
          const f = face[i]!;
          // The member's "blank": the box round its placed sections (it is cut from the slab, not freed as a box).
          const pts = [...f.root.outer, ...f.tip.outer];
          const us = pts.map((q) => q[0]);
          const vs = pts.map((q) => q[1]);
          return {
            part: m.part,
            placement: index,
            root: f.root,
            tip: f.tip,
            tapered: f.tapered,
            blank: { min: [Math.min(...us), Math.min(...vs)], max: [Math.max(...us), Math.max(...vs)] },
          };
        }),
      },
    });
  });
  return out;
}

/**
 * Every slab of a plan's profile parts with its program on a profile cutter (kerf and feed of the
 * block's grade on that machine). A slab the machine cannot cut comes back with the limit named
 * instead of a program.
 */
export async function runProfilePrograms(
  runId: number,
  machineId: number | null,
  choices: Pick<ProgramChoices, "direction" | "dwell"> = {},
): Promise<{ machine: StoredMachine; slabs: SlabProgram[] }> {
  const run = (await db()("nesting_runs").where({ id: runId }).first("id", "problem", "plan")) as
    | { id: number; problem: Problem; plan: Plan | null }
    | undefined;
  if (!run) throw new HttpError(404, "That plan was not found.");
  return slabPrograms(runId, run.problem, run.plan, machineId, choices);
}

/** The same for a plan at hand (a worker storing its plan). */
export async function slabPrograms(
  runId: number,
  problem: Problem,
  plan: Plan | null,
  machineId: number | null,
  choices: Pick<ProgramChoices, "direction" | "dwell"> & { listOnly?: boolean } = {},
): Promise<{ machine: StoredMachine; slabs: SlabProgram[] }> {
  const run = { problem, plan };
  const parts = await profilesOf(problem);
  if (!run.plan) throw new HttpError(409, "This plan has no layout yet: wait for it to finish.");
  // A box-nested plan: its profile parts grouped into slabs by block and layer. A true-shape plan
  // (version 2): each slab placement is one slab, its members where the nesting put them.
  const hasProfiles = run.plan.placements.some((p) => p.slab || parts.get(p.part)?.profile);
  if (!hasProfiles) throw new HttpError(409, "This plan has no profile parts: every part is a plain box.");
  const machine = await profileMachine(machineId);
  // Blanks of one layer that span more than the cutter's face are split into slabs that fit it.
  const slabs = planSlabs(run.plan, parts, slabMaxFor(machine).slice(1) as [number, number]);
  const shaped = trueShapeSlabs(run.plan, problem, slabs);
  const gradeIds = new Map(
    ((await db()("grades").select("id", "code")) as { id: number; code: string }[]).map((g) => [g.code, g.id]),
  );
  const out: SlabProgram[] = [];
  const perBlock = new Map<string, number>();
  for (const s of [...slabs, ...shaped.map((t) => t.slab)]) perBlock.set(s.block, (perBlock.get(s.block) ?? 0) + 1);
  const partsById = new Map(problem.parts.map((p) => [p.id, p]));
  for (const { slab: s, layout } of shaped) {
    const grade = run.problem.blocks.find((b) => b.id === s.block)?.grade;
    const { kerf, feed } = await kerfFeed(machine, grade ? (gradeIds.get(grade) ?? null) : null);
    const label = `${s.block} slab ${s.n}`;
    const names = layout.members.map((m) => parts.get(m.part)?.name ?? m.part);
    if (choices.listOnly) {
      out.push({ slab: s, label, program: null, problem: null, names });
      continue;
    }
    try {
      const input = slabProgramInput(
        `plan ${runId}, block ${s.block}, slab ${s.n} of ${perBlock.get(s.block)} (true shape)`,
        layout,
        partsById,
        (_id, k) => names[k]!,
        { kerf, feed, grade: grade ?? null },
      );
      const program = profileProgram({ ...input, direction: choices.direction, dwell: choices.dwell }, machine);
      out.push({ slab: s, label, program, problem: null, names });
    } catch (e) {
      if (e instanceof ProgramError || e instanceof FourAxisError || e instanceof ToolpathError)
        out.push({ slab: s, label, program: null, problem: e.message, names });
      else throw e;
    }
  }
  for (const s of slabs) {
    const grade = run.problem.blocks.find((b) => b.id === s.block)?.grade;
    const { kerf, feed } = await kerfFeed(machine, grade ? (gradeIds.get(grade) ?? null) : null);
    const label = `${s.block} slab ${s.n}`;
    const names = s.parts.map((p) => parts.get(p.part)?.name ?? p.part);
    if (choices.listOnly) {
      out.push({ slab: s, label, program: null, problem: null, names });
      continue;
    }
    try {
      // A part the others wall in is entered through a neighbour's kerf (layerProgram).
      const program = layerProgram(
        {
          title: `plan ${runId}, block ${s.block}, slab ${s.n} of ${perBlock.get(s.block)}`,
          size: s.size,
          thickness: s.along[1] - s.along[0],
          parts: s.parts.map((p, i) => ({ name: names[i]!, root: p.root, tip: p.tip, tapered: p.tapered })),
          kerf,
          feed,
          grade: grade ?? null,
          direction: choices.direction,
          dwell: choices.dwell,
        },
        machine,
      );
      out.push({ slab: s, label, program, problem: null, names });
    } catch (e) {
      if (e instanceof ProgramError || e instanceof FourAxisError || e instanceof ToolpathError)
        out.push({ slab: s, label, program: null, problem: e.message, names });
      else throw e;
    }
  }
  return { machine, slabs: out };
}

export interface ProfileTime {
  machine: string;
  slabs: number;
  /** Wire travel through the foam, mm (the faster face of a 4-axis cut). */
  lengthMm: number;
  /** Feed, rapids, dwells, heat-up and handling of every slab the machine can cut. */
  minutes: number;
  /** "HF-1001 slab 2: …" for slabs the machine cannot cut (not timed). */
  uncut: string[];
}

/** The time of a plan's slab programs (see `slabPrograms`). */
export function profileTime(machine: StoredMachine, slabs: readonly SlabProgram[]): ProfileTime {
  const made = slabs.filter((s) => s.program);
  return {
    machine: machine.name,
    slabs: made.length,
    lengthMm: made.reduce((n, s) => n + s.program!.feedMm, 0),
    minutes: made.reduce((n, s) => n + s.program!.minutes.total, 0),
    uncut: slabs.filter((s) => s.problem).map((s) => `${s.label}: ${s.problem}`),
  };
}

/**
 * The profile cuts' share of a plan's cut time: every slab's program on the shop's first active
 * profile cutter. Null when the plan has no profile parts or the shop no profile cutter.
 */
export async function planProfileTime(
  runId: number,
  at?: { problem: Problem; plan: Plan | null },
): Promise<ProfileTime | null> {
  try {
    const { machine, slabs } = at
      ? await slabPrograms(runId, at.problem, at.plan, null)
      : await runProfilePrograms(runId, null);
    return profileTime(machine, slabs);
  } catch (e) {
    if (e instanceof HttpError && e.status === 409) return null;
    throw e;
  }
}

/**
 * A plan's slab programs on the shop's first profile cutter, for its page; past PROFILE_PAGE_LIMIT
 * profile parts only the list of slabs (`listOnly`). Null without profile parts or a profile cutter.
 */
export async function planProfiles(run: {
  id: number;
  problem: Problem;
  plan: Plan | null;
}): Promise<{ machine: StoredMachine; slabs: SlabProgram[]; listOnly: boolean } | null> {
  const parts = await profilesOf(run.problem);
  const count = (run.plan?.placements ?? []).reduce(
    (n, p) => n + (p.slab ? p.slab.members.length : parts.get(p.part)?.profile ? 1 : 0),
    0,
  );
  const listOnly = count > PROFILE_PAGE_LIMIT;
  try {
    return { ...(await slabPrograms(run.id, run.problem, run.plan, null, { listOnly })), listOnly };
  } catch (e) {
    if (e instanceof HttpError && e.status === 409) return null;
    throw e;
  }
}
