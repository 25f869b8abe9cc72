import type { Metadata } from "next";
import Link from "next/link";
import { requirePage } from "@/lib/auth/guard";
import { allows } from "@/lib/auth/policy";
import { listClaims } from "@/db/queries/claims";
import { listBlocks } from "@/db/queries/blocks";
import { blockQuerySchema } from "@/lib/validations/stock";
import { formatDate, formatMoney } from "@/lib/format";
import {
  CLAIM_REASONS,
  CLAIM_REASON_LABELS,
  CLAIM_STATUS_LABELS,
  HOLD_LABELS,
  type ClaimReason,
  type ClaimStatus,
  type HoldReason,
} from "@/lib/stock";
import { Badge, Card, PageHeader } from "@/components/ui/card";
import { rowLinkClass } from "@/components/ui/button";
import { ClaimForm } from "@/components/claims/claim-form";
import { ClaimDecision } from "@/components/claims/claim-decision";
import { formatVolume } from "@/lib/units";

export const metadata: Metadata = { title: "Supplier claims" };

const TONE: Record<ClaimStatus, "plain" | "kerf" | "moss" | "ember"> = {
  open: "kerf",
  accepted: "moss",
  rejected: "ember",
  credited: "moss",
};
const usd = (v: number) => formatMoney(v);
/** A hold reason's matching claim reason, to start a claim from a held block. */
const CLAIM_FOR_HOLD: Partial<Record<HoldReason, ClaimReason>> = {
  under_density: "under_density",
  over_density: "over_density",
  wet: "wet",
  damaged: "damaged",
};

export default async function ClaimsPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | undefined>>;
}) {
  const user = await requirePage("/claims");
  const sp = await searchParams;
  const canEdit = allows(["buyer"], user.roles);
  const [claims, held] = await Promise.all([
    listClaims(),
    listBlocks(blockQuerySchema.parse({ status: "on_hold", sort: "received", dir: "desc", pageSize: 100 })),
  ]);
  const prefill = (sp.blocks ?? "").slice(0, 2000);
  const firstHeld = held.items.find((b) =>
    prefill
      .toUpperCase()
      .split(/[\s,;]+/)
      .includes(b.code.toUpperCase()),
  );
  const reason =
    sp.reason && (CLAIM_REASONS as readonly string[]).includes(sp.reason)
      ? (sp.reason as ClaimReason)
      : firstHeld?.hold
        ? (CLAIM_FOR_HOLD[firstHeld.hold.reason] ?? null)
        : null;
  const open = claims.filter((c) => c.status === "open" || c.status === "accepted");

  return (
    <>
      <PageHeader
        title="Supplier claims"
        lead={`Claims to suppliers for blocks that came in wrong: ${open.length} still waiting for an answer or a credit. Their outcome feeds the supplier quality report.`}
      />
      <div className="space-y-5">
        {canEdit && <ClaimForm blocks={prefill} reason={reason} />}

        <Card title={`Blocks on hold (${held.total})`}>
          {held.items.length === 0 ? (
            <p className="text-[15px] text-ink-soft">No block is on hold.</p>
          ) : (
            <ul className="grid gap-x-6 sm:grid-cols-2 lg:grid-cols-3">
              {held.items.map((b) => (
                <li key={b.id} className="flex flex-wrap items-center gap-x-2 text-[15px]">
                  <Link className={rowLinkClass} href={`/stock/${encodeURIComponent(b.code)}`}>
                    {b.code}
                  </Link>
                  <span className="text-ink-soft">
                    {b.gradeCode} · On hold: {b.hold ? HOLD_LABELS[b.hold.reason] : "–"}
                    {b.supplier && ` · ${b.supplier}`}
                  </span>
                </li>
              ))}
            </ul>
          )}
        </Card>

        <section aria-labelledby="claims-heading" className="space-y-3">
          <h2 id="claims-heading">Claims ({claims.length})</h2>
          {claims.length === 0 && <p className="text-[15px] text-ink-soft">No claims yet.</p>}
          {claims.map((c) => (
            <Card
              key={c.id}
              title={
                <span className="flex flex-wrap items-center gap-2">
                  Claim #{c.id} · {c.supplier} · {CLAIM_REASON_LABELS[c.reason]}
                  <Badge tone={TONE[c.status]}>{CLAIM_STATUS_LABELS[c.status]}</Badge>
                </span>
              }
            >
              <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-[15px]">
                <dt className="text-ink-soft">Opened</dt>
                <dd>
                  {formatDate(c.createdAt)} by {c.createdBy ?? "someone"}
                </dd>
                <dt className="text-ink-soft">Blocks</dt>
                <dd className="flex flex-wrap gap-x-3">
                  {c.blocks.map((b) => (
                    <Link key={b.id} className={rowLinkClass} href={`/stock/${encodeURIComponent(b.code)}`}>
                      {b.code}
                    </Link>
                  ))}
                  <span className="self-center text-ink-soft">
                    {formatVolume(
                      c.blocks.reduce((s, b) => s + b.volumeM3, 0),
                      { digits: 2 },
                    )}
                  </span>
                </dd>
                <dt className="text-ink-soft">Credit asked</dt>
                <dd>{usd(c.creditAsked)}</dd>
                {c.creditReceived !== null && (
                  <>
                    <dt className="text-ink-soft">Credit received</dt>
                    <dd>{usd(c.creditReceived)}</dd>
                  </>
                )}
                {c.note && (
                  <>
                    <dt className="text-ink-soft">Note</dt>
                    <dd>{c.note}</dd>
                  </>
                )}
                {c.decidedAt && (
                  <>
                    <dt className="text-ink-soft">Answer</dt>
                    <dd>
                      {CLAIM_STATUS_LABELS[c.status]} · {formatDate(c.decidedAt)} · {c.decidedBy ?? "someone"}
                      {c.decisionNote && ` · ${c.decisionNote}`}
                    </dd>
                  </>
                )}
              </dl>
              {c.photos.length > 0 && (
                <div className="mt-3 flex flex-wrap gap-2">
                  {c.photos.map((p, i) => (
                    <a
                      key={p.id}
                      href={`/api/claims/${c.id}/photos/${p.id}?size=full`}
                      target="_blank"
                      rel="noreferrer"
                      className="inline-block min-h-11 min-w-11"
                    >
                      {/* eslint-disable-next-line @next/next/no-img-element */}
                      <img
                        src={`/api/claims/${c.id}/photos/${p.id}?size=thumb`}
                        alt={`Claim ${c.id}, evidence ${i + 1} of ${c.photos.length}`}
                        className="h-20 w-28 rounded border border-bead object-cover"
                      />
                    </a>
                  ))}
                </div>
              )}
              {canEdit && (c.status === "open" || c.status === "accepted") && (
                <div className="mt-4 border-t border-bead pt-3">
                  <ClaimDecision claimId={c.id} status={c.status} />
                </div>
              )}
            </Card>
          ))}
        </section>
      </div>
    </>
  );
}
