import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import type { Plan } from "@/lib/nesting";

/** `HF-1001.7` → 7 when it is an offcut code of `HF-1001`, else null. */
export function offcutSuffix(parent: string, code: string): number | null {
  if (!code.startsWith(`${parent}.`)) return null;
  const rest = code.slice(parent.length + 1);
  return /^\d+$/.test(rest) ? Number(rest) : null;
}

/**
 * Fixes the codes of the offcuts an approved plan will make, block by block, in the order of the
 * plan's offcuts: the next numbers after every code the block's offcuts have used (as stock or
 * held by any plan, released ones included), so two plans never hand out one code and the sheet,
 * the labels and the recording agree.
 */
export async function allocateOffcutCodes(
  trx: Knex.Transaction,
  runId: number,
  blocks: readonly { id: number; code: string }[],
  plan: Plan,
): Promise<void> {
  const rows: { run_id: number; block_id: number; offcut_index: number; code: string }[] = [];
  for (const b of blocks) {
    const count = plan.offcuts.filter((o) => o.block === b.code).length;
    if (!count) continue;
    const like = `${b.code.replace(/[\\%_]/g, (c) => `\\${c}`)}.%`;
    const used = [
      ...((await trx("blocks").where("code", "like", like).select("code")) as { code: string }[]),
      ...((await trx("plan_offcut_codes").where({ block_id: b.id }).select("code")) as { code: string }[]),
    ];
    let last = used.reduce((m, r) => Math.max(m, offcutSuffix(b.code, r.code) ?? 0), 0);
    for (let i = 0; i < count; i++)
      rows.push({ run_id: runId, block_id: b.id, offcut_index: i, code: `${b.code}.${++last}` });
  }
  if (rows.length) await trx("plan_offcut_codes").insert(rows);
}

/** The fixed offcut codes of a plan: block id → codes by offcut index (empty for plans approved before codes were fixed). */
export async function offcutCodesOf(runId: number, k: Knex = db()): Promise<Map<number, string[]>> {
  const rows = (await k("plan_offcut_codes")
    .where({ run_id: runId })
    .orderBy(["block_id", "offcut_index"])
    .select("block_id", "offcut_index", "code")) as { block_id: number; offcut_index: number; code: string }[];
  const out = new Map<number, string[]>();
  for (const r of rows) {
    const list = out.get(r.block_id) ?? [];
    list[r.offcut_index] = r.code;
    out.set(r.block_id, list);
  }
  return out;
}
