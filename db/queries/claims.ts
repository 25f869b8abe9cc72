import "server-only";
import crypto from "node:crypto";
import type { Knex } from "knex";
import { db } from "@/db";
import { HttpError, notFound } from "@/lib/errors";
import {
  CLAIM_STATUS_LABELS,
  type BlockStatus,
  type ClaimReason,
  type ClaimStatus,
  type HoldReason,
} from "@/lib/stock";
import type { ClaimDecisionInput, ClaimInput } from "@/lib/validations/claims";
import type { NewPhoto } from "./photos";

export interface ClaimPhoto {
  id: number;
  contentType: string;
  bytes: number;
  width: number | null;
  height: number | null;
  uploadedAt: string;
}

export interface ClaimBlock {
  id: number;
  code: string;
  gradeCode: string;
  lot: string;
  volumeM3: number;
  status: BlockStatus;
  holdReason: HoldReason | null;
}

export interface SupplierClaim {
  id: number;
  supplierId: number;
  supplier: string;
  reason: ClaimReason;
  note: string | null;
  creditAsked: number;
  status: ClaimStatus;
  creditReceived: number | null;
  decisionNote: string | null;
  decidedAt: string | null;
  decidedBy: string | null;
  createdAt: string;
  createdBy: string | null;
  blocks: ClaimBlock[];
  photos: ClaimPhoto[];
}

interface ClaimRow {
  id: number;
  supplier_id: number;
  supplier_name: string;
  reason: ClaimReason;
  note: string | null;
  credit_asked: number;
  status: ClaimStatus;
  credit_received: number | null;
  decision_note: string | null;
  decided_at: Date | null;
  decided_by_name: string | null;
  created_at: Date;
  created_by_name: string | null;
}

function claimsBase(k: Knex | Knex.Transaction) {
  return k("supplier_claims as c")
    .join("suppliers as s", "s.id", "c.supplier_id")
    .leftJoin("users as cu", "cu.id", "c.created_by")
    .leftJoin("users as du", "du.id", "c.decided_by")
    .select("c.*", "s.name as supplier_name", "cu.name as created_by_name", "du.name as decided_by_name");
}

async function withDetails(k: Knex | Knex.Transaction, rows: ClaimRow[]): Promise<SupplierClaim[]> {
  if (!rows.length) return [];
  const ids = rows.map((r) => r.id);
  const [blocks, photos] = await Promise.all([
    k("supplier_claim_blocks as cb")
      .join("blocks as b", "b.id", "cb.block_id")
      .join("grades as g", "g.id", "b.grade_id")
      .whereIn("cb.claim_id", ids)
      .orderBy("b.code")
      .select(
        "cb.claim_id",
        "b.id",
        "b.code",
        "g.code as grade_code",
        "b.lot",
        "b.volume_m3",
        "b.status",
        "b.hold_reason",
      ) as Promise<
      {
        claim_id: number;
        id: number;
        code: string;
        grade_code: string;
        lot: string;
        volume_m3: number;
        status: BlockStatus;
        hold_reason: HoldReason | null;
      }[]
    >,
    k("supplier_claim_photos").whereIn("claim_id", ids).orderBy("id") as Promise<
      {
        id: number;
        claim_id: number;
        content_type: string;
        bytes: number;
        width: number | null;
        height: number | null;
        uploaded_at: Date;
      }[]
    >,
  ]);
  return rows.map((r) => ({
    id: r.id,
    supplierId: r.supplier_id,
    supplier: r.supplier_name,
    reason: r.reason,
    note: r.note,
    creditAsked: Number(r.credit_asked),
    status: r.status,
    creditReceived: r.credit_received === null ? null : Number(r.credit_received),
    decisionNote: r.decision_note,
    decidedAt: r.decided_at ? r.decided_at.toISOString() : null,
    decidedBy: r.decided_by_name,
    createdAt: r.created_at.toISOString(),
    createdBy: r.created_by_name,
    blocks: blocks
      .filter((b) => b.claim_id === r.id)
      .map((b) => ({
        id: b.id,
        code: b.code,
        gradeCode: b.grade_code,
        lot: b.lot,
        volumeM3: Number(b.volume_m3),
        status: b.status,
        holdReason: b.hold_reason,
      })),
    photos: photos
      .filter((p) => p.claim_id === r.id)
      .map((p) => ({
        id: p.id,
        contentType: p.content_type,
        bytes: p.bytes,
        width: p.width,
        height: p.height,
        uploadedAt: p.uploaded_at.toISOString(),
      })),
  }));
}

/** Claims to suppliers, newest first; open ones (and a supplier's) when asked. */
export async function listClaims(
  opts: { supplierId?: number; status?: ClaimStatus | "decided"; limit?: number } = {},
): Promise<SupplierClaim[]> {
  const k = db();
  const q = claimsBase(k)
    .orderBy([
      { column: "c.created_at", order: "desc" },
      { column: "c.id", order: "desc" },
    ])
    .limit(opts.limit ?? 200);
  if (opts.supplierId) q.where("c.supplier_id", opts.supplierId);
  if (opts.status === "decided") q.whereNot("c.status", "open");
  else if (opts.status) q.where("c.status", opts.status);
  return withDetails(k, (await q) as ClaimRow[]);
}

export async function getClaim(id: number, k: Knex | Knex.Transaction = db()): Promise<SupplierClaim | undefined> {
  const r = (await claimsBase(k).where("c.id", id).first()) as ClaimRow | undefined;
  return r ? (await withDetails(k, [r]))[0] : undefined;
}

/**
 *   createClaim({ reason: "under_density", creditAsked: 420, blocks: ["HF-1047"], note }, userId)
 * Opens a claim to the supplier that delivered the blocks (all of them from one supplier; the one
 * named, when one is). Each refused block is named in `blocks.<i>`; nothing is saved then.
 */
export async function createClaim(input: ClaimInput, actorId: string): Promise<SupplierClaim> {
  return db().transaction(async (trx) => {
    const wanted = input.blocks.map((c) => c.trim().toUpperCase());
    const rows = (await trx("blocks as b")
      .leftJoin("deliveries as d", "d.id", "b.delivery_id")
      .leftJoin("suppliers as s", "s.id", "d.supplier_id")
      .whereRaw("upper(b.code) = ANY(?)", [wanted])
      .select("b.id", "b.code", "d.supplier_id", "s.name as supplier_name")) as {
      id: number;
      code: string;
      supplier_id: number | null;
      supplier_name: string | null;
    }[];
    const byCode = new Map(rows.map((r) => [r.code.toUpperCase(), r]));
    const named = input.supplierId
      ? ((await trx("suppliers").where({ id: input.supplierId }).first("id", "name")) as
          | { id: number; name: string }
          | undefined)
      : undefined;
    const fields: Record<string, string> = {};
    if (input.supplierId && !named) fields.supplierId = "That supplier does not exist.";
    const seen = new Map<string, number>();
    let supplier: { id: number; name: string } | null = named ?? null;
    wanted.forEach((code, i) => {
      const b = byCode.get(code);
      if (seen.has(code))
        fields[`blocks.${i}`] = `${input.blocks[i]} is listed twice (also line ${seen.get(code)! + 1}).`;
      else if (!b) fields[`blocks.${i}`] = `No block ${input.blocks[i]} in the register.`;
      else if (b.supplier_id === null)
        fields[`blocks.${i}`] = `${b.code} has no delivery on record, so no supplier to claim from.`;
      else if (supplier && b.supplier_id !== supplier.id)
        fields[`blocks.${i}`] =
          `${b.code} came from ${b.supplier_name}, not from ${supplier.name}: one claim is to one supplier.`;
      else supplier ??= { id: b.supplier_id, name: b.supplier_name! };
      seen.set(code, i);
    });
    const found = wanted.map((c) => byCode.get(c)).filter((b): b is NonNullable<typeof b> => !!b);
    if (found.length && !Object.keys(fields).length) {
      const open = (await trx("supplier_claim_blocks as cb")
        .join("supplier_claims as c", "c.id", "cb.claim_id")
        .whereIn(
          "cb.block_id",
          found.map((b) => b.id),
        )
        .whereIn("c.status", ["open", "accepted"])
        .select("cb.block_id", "c.id as claim_id", "c.status")) as {
        block_id: number;
        claim_id: number;
        status: ClaimStatus;
      }[];
      for (const o of open) {
        const i = found.findIndex((b) => b.id === o.block_id);
        fields[`blocks.${i}`] =
          `${found[i]!.code} is already on claim #${o.claim_id} (${CLAIM_STATUS_LABELS[o.status].toLowerCase()}).`;
      }
    }
    if (Object.keys(fields).length) {
      const first = Object.values(fields)[0]!;
      throw new HttpError(400, `The claim was not opened: ${first}`, fields);
    }
    const [claim] = await trx("supplier_claims")
      .insert({
        supplier_id: supplier!.id,
        reason: input.reason,
        note: input.note,
        credit_asked: input.creditAsked,
        status: "open",
        created_by: actorId,
      })
      .returning("id");
    if (!claim) throw new Error("The claim was not saved.");
    await trx("supplier_claim_blocks").insert(found.map((b) => ({ claim_id: claim.id, block_id: b.id })));
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "claim.open",
      subject: `claim:${claim.id}`,
      detail: { ...input, supplierId: supplier!.id },
    });
    return (await getClaim(claim.id, trx))!;
  });
}

/** Which answers a claim in each state may still get: open → any; accepted → credited. */
const NEXT: Record<ClaimStatus, readonly ClaimDecisionInput["outcome"][]> = {
  open: ["accepted", "rejected", "credited"],
  accepted: ["credited"],
  rejected: [],
  credited: [],
};

/**
 *   decideClaim(3, { outcome: "credited", creditReceived: 380, note: "Credit note CN-2231" }, userId)
 * Records the supplier's answer. A claim accepted may later be credited; a rejected or credited
 * claim is settled and does not change.
 */
export async function decideClaim(id: number, input: ClaimDecisionInput, actorId: string): Promise<SupplierClaim> {
  return db().transaction(async (trx) => {
    const c = await trx("supplier_claims").where({ id }).forUpdate().first("id", "status", "credit_asked");
    if (!c) throw notFound(`Claim #${id}`);
    const status = c.status as ClaimStatus;
    if (!NEXT[status].includes(input.outcome)) {
      const now = CLAIM_STATUS_LABELS[status].toLowerCase();
      throw new HttpError(
        409,
        status === "rejected" || status === "credited"
          ? `Claim #${id} is already ${now}: a settled claim does not change.`
          : `Claim #${id} is already ${now}: only the credit can still be recorded.`,
        { outcome: `Claim #${id} is ${now}.` },
      );
    }
    await trx("supplier_claims")
      .where({ id })
      .update({
        status: input.outcome,
        credit_received: input.outcome === "rejected" ? null : (input.creditReceived ?? null),
        decision_note: input.note,
        decided_at: trx.fn.now(),
        decided_by: actorId,
      });
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "claim.decide",
      subject: `claim:${id}`,
      detail: { from: status, ...input },
    });
    return (await getClaim(id, trx))!;
  });
}

/** Object keys for a claim's photo and its thumbnail. */
export function claimPhotoKeys(claimId: number, ext: string): { objectKey: string; thumbKey: string } {
  const id = crypto.randomUUID();
  return { objectKey: `claims/${claimId}/${id}.${ext}`, thumbKey: `claims/${claimId}/${id}.thumb.webp` };
}

/** Records photos already in the bucket for a claim, in one transaction (with an audit entry). */
export async function addClaimPhotos(claimId: number, photos: NewPhoto[], actorId: string): Promise<ClaimPhoto[]> {
  return db().transaction(async (trx) => {
    const rows = (await trx("supplier_claim_photos")
      .insert(
        photos.map((p) => ({
          claim_id: claimId,
          object_key: p.objectKey,
          thumb_key: p.thumbKey,
          content_type: p.contentType,
          bytes: p.bytes,
          width: p.width,
          height: p.height,
          uploaded_by: actorId,
        })),
      )
      .returning(["id", "content_type", "bytes", "width", "height", "uploaded_at"])) as {
      id: number;
      content_type: string;
      bytes: number;
      width: number | null;
      height: number | null;
      uploaded_at: Date;
    }[];
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "claim.photos",
      subject: `claim:${claimId}`,
      detail: { photos: rows.map((r) => r.id) },
    });
    return rows.map((r) => ({
      id: r.id,
      contentType: r.content_type,
      bytes: r.bytes,
      width: r.width,
      height: r.height,
      uploadedAt: r.uploaded_at.toISOString(),
    }));
  });
}

export async function getClaimPhoto(
  claimId: number,
  photoId: number,
): Promise<{ id: number; objectKey: string; thumbKey: string; contentType: string } | undefined> {
  const r = await db()("supplier_claim_photos")
    .where({ id: photoId, claim_id: claimId })
    .first("id", "object_key", "thumb_key", "content_type");
  return r ? { id: r.id, objectKey: r.object_key, thumbKey: r.thumb_key, contentType: r.content_type } : undefined;
}
