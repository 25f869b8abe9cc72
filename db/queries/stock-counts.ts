import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import type { BlocksInsert } from "@/db/tables";
import { appendLedger } from "./ledger";
import { describeCharacter } from "@/lib/block-code";
import { HttpError } from "@/lib/errors";
import type { ScanCountInput } from "@/lib/validations/stock-count";
import type { Vec3 } from "@/lib/nesting";

/**
 * Stock counts: what a count found, checked against the register and reconciled in the ledger.
 * One reconciliation for both ways of counting: the CSV stock count (db/queries/imports.ts) and
 * the count by scanning labels on the tablet (/stock/count). A block found at another place is
 * moved (and the move kept in the audit log); a block re-measured gets an "adjusted" ledger entry
 * for the change in volume; a block not found is written off with a "scrapped" entry. Every entry
 * of one count carries the ref `count:<id>` (the count's row in csv_imports).
 */

/** A block as a count sees it. */
export interface CountBlock {
  id: number;
  code: string;
  status: string;
  location: string;
  size: Vec3;
  volume: number;
  cost: number;
  gradeCode: string;
}

/** What a count says about one block. */
export interface CountChange {
  block: CountBlock;
  /** Where it was found (for a block not found: where it was recorded). */
  location: string;
  present: boolean;
  /** The measured size, when someone measured it. */
  size: Vec3 | null;
  note: string | null;
}

interface BlockRow {
  id: number;
  code: string;
  status: string;
  location: string;
  size_x: number;
  size_y: number;
  size_z: number;
  volume_m3: number;
  cost: number;
  grade_code: string;
}

const toCountBlock = (b: BlockRow): CountBlock => ({
  id: Number(b.id),
  code: String(b.code),
  status: String(b.status),
  location: String(b.location),
  size: [Number(b.size_x), Number(b.size_y), Number(b.size_z)],
  volume: Number(b.volume_m3),
  cost: Number(b.cost),
  gradeCode: String(b.grade_code),
});

function selectCountBlocks(k: Knex | Knex.Transaction, lock: boolean) {
  const q = k("blocks as b")
    .join("grades as g", "g.id", "b.grade_id")
    .select(
      "b.id",
      "b.code",
      "b.status",
      "b.location",
      "b.size_x",
      "b.size_y",
      "b.size_z",
      "b.volume_m3",
      "b.cost",
      "g.code as grade_code",
    );
  return lock ? q.forUpdate("b") : q;
}

/** The blocks with these codes (any case), keyed by the upper-cased code; `lock` inside a transaction. */
export async function countBlocks(
  k: Knex | Knex.Transaction,
  codes: string[],
  lock = false,
): Promise<Map<string, CountBlock>> {
  if (!codes.length) return new Map();
  const rows: BlockRow[] = await selectCountBlocks(k, lock).whereRaw("upper(b.code) = ANY(?)", [codes]);
  return new Map(rows.map((r) => [String(r.code).toUpperCase(), toCountBlock(r)]));
}

/**
 * Why a counted code cannot be reconciled, or null: not in the register (naming an invisible
 * character when there is one, the usual reason a code on the shelf is "not found"), no longer in
 * stock, or (when it is to be written off) earmarked for a plan.
 */
export function countProblem(code: string, block: CountBlock | undefined, present = true): string | null {
  if (!block) {
    const chars = Array.from(code);
    const odd = chars.findIndex((ch) => !/[A-Za-z0-9._-]/.test(ch));
    return odd < 0
      ? `No block ${code} in the register.`
      : `No block ${code} in the register: character ${odd + 1} is ${describeCharacter(chars[odd]!)}.`;
  }
  if (block.status === "cut" || block.status === "written_off")
    return `Block ${block.code} is no longer in stock (${block.status === "cut" ? "cut up" : "written off"}).`;
  if (!present && block.status === "earmarked")
    return `Block ${block.code} is earmarked for a plan; release it before writing it off.`;
  return null;
}

/**
 * Writes a checked count (inside the caller's transaction): moves, re-measures and write-offs, each
 * in the ledger or the audit log under `ref`. Changes with nothing to change are skipped.
 */
export async function applyCount(
  trx: Knex.Transaction,
  changes: CountChange[],
  ref: string,
  actorId: string,
): Promise<void> {
  const moved: { code: string; from: string; to: string }[] = [];
  const writtenOff: string[] = [];
  for (const ch of changes) {
    const b = ch.block;
    if (!ch.present) {
      await trx("blocks").where({ id: b.id }).update({ status: "written_off", updated_at: trx.fn.now() });
      await appendLedger(trx, [
        {
          blockId: b.id,
          kind: "scrapped",
          volumeM3: b.volume,
          value: b.cost,
          userId: actorId,
          reason: ch.note ?? "Not found at stock count",
          ref,
        },
      ]);
      writtenOff.push(b.code);
      continue;
    }
    const patch: Partial<BlocksInsert> = {};
    if (ch.location !== b.location) {
      patch.location = ch.location;
      moved.push({ code: b.code, from: b.location, to: ch.location });
    }
    if (ch.size?.some((v, i) => Math.abs(v - b.size[i]!) > 1e-6)) {
      patch.size_x = ch.size[0];
      patch.size_y = ch.size[1];
      patch.size_z = ch.size[2];
    }
    if (!Object.keys(patch).length) continue;
    const [after] = await trx("blocks")
      .where({ id: b.id })
      .update({ ...patch, updated_at: trx.fn.now() })
      .returning("volume_m3");
    const delta = Number(after!.volume_m3) - b.volume;
    if (Math.abs(delta) > 0) {
      await appendLedger(trx, [
        {
          blockId: b.id,
          kind: "adjusted",
          volumeM3: delta,
          value: 0,
          userId: actorId,
          reason: ch.note ?? "Re-measured at stock count",
          ref,
        },
      ]);
    }
  }
  if (moved.length || writtenOff.length) {
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "stock_count",
      subject: ref,
      detail: JSON.stringify({ moved, writtenOff }),
    });
  }
}

// ---- counting by scanning labels ----

/** One counted block as the count page shows it. */
export interface CountedLine {
  code: string;
  gradeCode: string;
  status: string;
  /** The size in the register (mm). */
  size: Vec3;
  /** Where the register has it. */
  recordedLocation: string;
  /** Where it was found. */
  location: string;
  moved: boolean;
  /** The measured size when it differs from the register's. */
  remeasured: Vec3 | null;
}

/** A block of the place counted that nobody counted. */
export interface MissingLine {
  code: string;
  gradeCode: string;
  size: Vec3;
  location: string;
  /** Earmarked for a plan: listed, not written off (the planner releases it first). */
  earmarked: boolean;
}

export interface ScanCountReport {
  committed: boolean;
  /** The ledger's ref for this count (`count:<id>`), once committed. */
  ref: string | null;
  /** The place counted; null: the whole yard. */
  location: string | null;
  counted: CountedLine[];
  missing: MissingLine[];
  summary: { counted: number; moved: number; remeasured: number; missing: number; writtenOff: number };
}

// Blocks physically in the yard: usable stock and stock on hold (a held block not found is lost
// too, and may be written off like any other; an earmarked one waits for the planner).
const IN_THE_YARD = ["in_stock", "earmarked", "on_hold"];

/** A counted block's details, as the page shows them after a scan (404/409 naming the code). */
export async function checkCountedBlock(code: string): Promise<CountedLine> {
  const wanted = code.trim().toUpperCase();
  const block = (await countBlocks(db(), [wanted])).get(wanted);
  const problem = countProblem(wanted, block);
  if (problem || !block) throw new HttpError(block ? 409 : 404, problem ?? `No block ${wanted} in the register.`);
  return line(block, block.location, null);
}

function line(block: CountBlock, location: string, size: Vec3 | null): CountedLine {
  const remeasured = size?.some((v, i) => Math.abs(v - block.size[i]!) > 1e-6) ? size : null;
  return {
    code: block.code,
    gradeCode: block.gradeCode,
    status: block.status,
    size: block.size,
    recordedLocation: block.location,
    location,
    moved: location !== block.location,
    remeasured,
  };
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/**
 * Checks a count by scanning against the register and, with `commit`, reconciles it: every block
 * counted is confirmed where it was found (moved when that is elsewhere, re-measured when a size
 * was given), and every block of the place counted (the whole yard when `location` is null) that
 * was not counted is written off, except those earmarked for a plan. A code not in the register,
 * or no longer in stock, refuses the whole count naming it (422); committing needs the missing
 * blocks the person confirmed, and refuses (409) when the stock changed since, so nothing is
 * written off that nobody saw listed. All or nothing.
 */
export async function reconcileScanCount(
  input: ScanCountInput,
  actorId: string,
  commit: boolean,
): Promise<ScanCountReport> {
  const work = async (k: Knex | Knex.Transaction): Promise<ScanCountReport> => {
    const codes = input.counted.map((c) => c.code.toUpperCase());
    const blocks = await countBlocks(k, codes, commit);
    const fields: Record<string, string> = {};
    const seen = new Map<string, number>();
    codes.forEach((code, i) => {
      const twice = seen.get(code);
      const problem =
        twice !== undefined
          ? `Block ${code} is counted twice (lines ${twice + 1} and ${i + 1}).`
          : countProblem(code, blocks.get(code));
      if (problem) fields[`counted.${i}.code`] = problem;
      if (twice === undefined) seen.set(code, i);
    });
    const problems = Object.values(fields);
    if (problems.length) {
      const more = problems.length > 1 ? ` (and ${plural(problems.length - 1, "other problem")})` : "";
      throw new HttpError(422, `${problems[0]}${more} Nothing was changed.`, fields);
    }

    const counted = input.counted.map((c, i) => {
      const block = blocks.get(codes[i]!)!;
      return line(block, c.location || input.location || block.location, c.size ?? null);
    });
    const countedIds = input.counted.map((_, i) => blocks.get(codes[i]!)!.id);
    const missingQ = selectCountBlocks(k, commit)
      .whereIn("b.status", IN_THE_YARD)
      .whereNotIn("b.id", countedIds)
      .orderBy("b.code");
    if (input.location) missingQ.where("b.location", input.location);
    const missingBlocks = ((await missingQ) as BlockRow[]).map(toCountBlock);
    const missing: MissingLine[] = missingBlocks.map((b) => ({
      code: b.code,
      gradeCode: b.gradeCode,
      size: b.size,
      location: b.location,
      earmarked: b.status === "earmarked",
    }));
    const writeOff = missingBlocks.filter((b) => b.status !== "earmarked");
    const report: ScanCountReport = {
      committed: false,
      ref: null,
      location: input.location,
      counted,
      missing,
      summary: {
        counted: counted.length,
        moved: counted.filter((c) => c.moved).length,
        remeasured: counted.filter((c) => c.remeasured).length,
        missing: missing.length,
        writtenOff: writeOff.length,
      },
    };
    if (!commit) return report;

    // The person confirmed a list of missing blocks: the register must still say the same.
    if (!input.missing)
      throw new HttpError(400, "Check the count first: confirm the blocks not found. Nothing was changed.");
    const confirmed = new Set(input.missing.map((c) => c.toUpperCase()));
    const now = new Set(missing.map((m) => m.code.toUpperCase()));
    const appeared = missing.filter((m) => !confirmed.has(m.code.toUpperCase())).map((m) => m.code);
    const gone = [...confirmed].filter((c) => !now.has(c));
    if (appeared.length || gone.length) {
      const what = [
        appeared.length ? `not found now but not in the list you confirmed: ${appeared.slice(0, 5).join(", ")}` : "",
        gone.length ? `in your list but no longer missing here: ${gone.slice(0, 5).join(", ")}` : "",
      ]
        .filter(Boolean)
        .join("; ");
      throw new HttpError(
        409,
        `The stock changed since the count was checked (${what}). Check it again; nothing was changed.`,
      );
    }

    const place = input.location ? `at ${input.location}` : "of the whole yard";
    const [row] = await k("csv_imports")
      .insert({
        kind: "stock_count",
        file_name: `Count by scanning ${place}`,
        rows: counted.length,
        imported_by: actorId,
      })
      .returning("id");
    const ref = `count:${row!.id}`;
    const changes: CountChange[] = [
      ...input.counted.map((c, i) => ({
        block: blocks.get(codes[i]!)!,
        location: counted[i]!.location,
        present: true,
        size: c.size ?? null,
        note: null,
      })),
      ...writeOff.map((b) => ({
        block: b,
        location: b.location,
        present: false,
        size: null,
        note: `Not found at stock count ${place}`,
      })),
    ];
    await applyCount(k as Knex.Transaction, changes, ref, actorId);
    return { ...report, committed: true, ref };
  };
  return commit ? db().transaction((trx) => work(trx)) : work(db());
}
