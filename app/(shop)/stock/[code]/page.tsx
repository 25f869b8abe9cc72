import { formatDate, formatDateTime, formatMoney, plural } from "@/lib/format";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePage } from "@/lib/auth/guard";
import { seesMoney } from "@/lib/auth/policy";
import { BLOCK_PAGE_HISTORY_MAX, getBlockPage } from "@/db/queries/blocks";
import { mayChangeZone } from "@/db/queries/defects";
import { displayUnit } from "@/lib/display";
import { Card, Notice, PageHeader } from "@/components/ui/card";
import { GradeChip, StatusBadge } from "@/components/stock/status-badge";
import { BlockActions } from "@/components/stock/block-actions";
import { HoldActions } from "@/components/stock/hold-actions";
import { FaceViews } from "@/components/stock/face-views";
import { ZoneEdit } from "@/components/stock/zone-edit";
import { buttonClass } from "@/components/ui/button";
import { DEFECT_LABELS, HOLD_LABELS, LEDGER_LABELS, STATUS_LABELS } from "@/lib/stock";
import { formatLength, formatSize, formatVolume } from "@/lib/units";

export async function generateMetadata({ params }: { params: Promise<{ code: string }> }): Promise<Metadata> {
  return { title: decodeURIComponent((await params).code) };
}

/** Movements and zone events shown at first; `?history=all` shows them all (up to BLOCK_PAGE_HISTORY_MAX). */
const HISTORY_SHOWN = 20;

export default async function BlockPage({
  params,
  searchParams,
}: {
  params: Promise<{ code: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requirePage("/stock/[code]");
  const code = decodeURIComponent((await params).code);
  const all = (await searchParams).history === "all";
  // One statement for everything below (db/queries/blocks.ts, getBlockPage).
  const [data, unit] = await Promise.all([
    getBlockPage(code, { historyLimit: all ? BLOCK_PAGE_HISTORY_MAX : HISTORY_SHOWN }),
    displayUnit(user),
  ]);
  if (!data) notFound();
  const { block, defects, offcuts, history, zoneHistory } = data;
  const allHref = `/stock/${encodeURIComponent(block.code)}?history=all`;
  const has = (...r: string[]) => user.roles.some((x) => x === "admin" || r.includes(x));
  const lowDensity = block.densityKgM3 !== null && block.minDensity !== null && block.densityKgM3 < block.minDensity;
  const inStock = block.status === "in_stock";
  const held = block.status === "on_hold" ? block.hold : null;
  const canHold = inStock && has("buyer", "cutter");
  const canRelease = has("buyer");
  const canMove = has("buyer", "cutter");
  const canCorrect = has("buyer");

  return (
    <>
      <PageHeader
        title={block.code}
        lead={
          <span className="flex flex-wrap items-center gap-3">
            <GradeChip code={block.gradeCode} colour={block.colour} noWire={block.neverHotWire} />
            <span>{block.gradeLabel}</span>
            <StatusBadge status={block.shown} hold={held?.reason} />
            {block.isOffcut && (
              <span>
                Offcut of <Link href={`/stock/${encodeURIComponent(block.parentCode!)}`}>{block.parentCode}</Link>
              </span>
            )}
          </span>
        }
        actions={
          <Link className={buttonClass("secondary")} href={`/labels?codes=${encodeURIComponent(block.code)}`}>
            Print label
          </Link>
        }
      />
      <div className="space-y-5">
        {block.neverHotWire && (
          <Notice tone="danger" title="Never hot-wire this material">
            Polyurethane gives off isocyanates, amines and hydrogen cyanide when heated. Route or carve it; follow its
            safety data sheet and local rules.
          </Notice>
        )}
        {held && (
          <Notice tone="caution" title={`On hold: ${HOLD_LABELS[held.reason]}`}>
            {held.note && <>{held.note} </>}
            Held by {held.by ?? "someone"} on {formatDate(held.since)}. Not counted on hand for reordering and not
            offered to planning until the buyer releases it.
          </Notice>
        )}
        {block.shown === "settling" && (
          <Notice tone="caution">
            Still settling: cutting before {block.cutNotBefore} risks out-of-square, warped parts.
          </Notice>
        )}
        {lowDensity && (
          <Notice tone="caution">
            Measured density {block.densityKgM3!.toFixed(1)} kg/m³ is below the {block.gradeCode} minimum of{" "}
            {block.minDensity} kg/m³. Check the weighing and tell the supplier.
          </Notice>
        )}

        <div className="grid gap-5 lg:grid-cols-[1fr_20rem]">
          <Card title="Faces and defects">
            <FaceViews
              size={block.size}
              defects={defects.map((d) => ({ id: d.id, kind: d.kind, min: d.min, max: d.max }))}
              unit={unit}
            />
          </Card>
          <Card title="Facts">
            <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1.5 text-sm">
              <dt className="text-ink-faint">Measured</dt>
              <dd>{formatSize(block.size, unit)}</dd>
              <dt className="text-ink-faint">Nominal</dt>
              <dd>{formatSize(block.nominalSize, unit)}</dd>
              <dt className="text-ink-faint">Volume</dt>
              <dd>{formatVolume(block.volumeM3, { boardFeet: true })}</dd>
              <dt className="text-ink-faint">Weight</dt>
              <dd>{block.weightKg === null ? "not weighed" : `${block.weightKg} kg`}</dd>
              <dt className="text-ink-faint">Density</dt>
              <dd className={lowDensity ? "font-semibold text-ember" : ""}>
                {block.densityKgM3 === null ? "–" : `${block.densityKgM3.toFixed(1)} kg/m³`}
                {block.minDensity !== null && <span className="text-ink-faint"> (min {block.minDensity})</span>}
              </dd>
              {seesMoney(user.roles) && block.cost !== null && (
                <>
                  <dt className="text-ink-faint">Value</dt>
                  <dd>{formatMoney(block.cost)}</dd>
                </>
              )}
              <dt className="text-ink-faint">Location</dt>
              <dd>{block.location}</dd>
              <dt className="text-ink-faint">Lot</dt>
              <dd>{block.lot}</dd>
              <dt className="text-ink-faint">Supplier</dt>
              <dd>
                {block.supplier ?? "–"}
                {block.poRef && <span className="text-ink-faint"> · {block.poRef}</span>}
              </dd>
              <dt className="text-ink-faint">Received</dt>
              <dd>{block.receivedOn ?? "–"}</dd>
              <dt className="text-ink-faint">Moulded</dt>
              <dd>{block.mouldedOn ?? "–"}</dd>
              <dt className="text-ink-faint">Cut not before</dt>
              <dd>
                {block.cutNotBefore} <span className="text-ink-faint">({plural(block.cureDays, "day")})</span>
              </dd>
              <dt className="text-ink-faint">FIFO</dt>
              <dd>{block.fifo ? `#${block.fifo} of ready ${block.gradeCode}` : "–"}</dd>
              <dt className="text-ink-faint">Status</dt>
              <dd>
                {STATUS_LABELS[block.shown]}
                {held && `: ${HOLD_LABELS[held.reason]}`}
              </dd>
            </dl>
          </Card>
        </div>

        <Card
          title={`Defect zones (${defects.length})`}
          action={
            has("cutter") && inStock ? (
              <Link className={buttonClass("secondary")} href={`/defects/new?code=${encodeURIComponent(block.code)}`}>
                Flag a defect
              </Link>
            ) : undefined
          }
        >
          {defects.length === 0 ? (
            <p className="text-sm text-ink-soft">None recorded.</p>
          ) : (
            <ul className="divide-y divide-bead">
              {defects.map((d) => (
                <li key={d.id} className="flex flex-wrap items-start gap-4 py-3 text-sm">
                  <div className="min-w-56">
                    <p className="font-medium">
                      {DEFECT_LABELS[d.kind]} <span className="font-normal text-ink-faint">#{d.id}</span>
                    </p>
                    <p className="text-ink-soft">
                      from ({d.min.map((v) => formatLength(v, unit)).join(", ")}) to (
                      {d.max.map((v) => formatLength(v, unit)).join(", ")})
                    </p>
                    <p className="text-ink-faint">
                      {d.foundBy ?? "someone"} · {formatDate(d.foundAt)}
                      {d.inheritedFrom && " · carried over from the parent block"}
                      {d.updatedAt && ` · corrected by ${d.updatedBy ?? "someone"} · ${formatDate(d.updatedAt)}`}
                    </p>
                    {d.note && <p>{d.note}</p>}
                    {mayChangeZone(d, user) && (
                      <div className="mt-1">
                        <ZoneEdit
                          zone={{ id: d.id, kind: d.kind, min: d.min, max: d.max, note: d.note }}
                          blockCode={block.code}
                          size={block.size}
                        />
                      </div>
                    )}
                  </div>
                  <div className="flex flex-wrap gap-2">
                    {d.photos.map((p) => (
                      <a key={p.id} href={`/api/photos/${p.id}?size=full`} target="_blank" rel="noreferrer">
                        {/* eslint-disable-next-line @next/next/no-img-element */}
                        <img
                          src={`/api/photos/${p.id}?size=thumb`}
                          alt={`Defect ${d.id}`}
                          className="h-20 w-28 rounded border border-bead object-cover"
                        />
                      </a>
                    ))}
                  </div>
                </li>
              ))}
            </ul>
          )}
          {(zoneHistory.some((e) => e.action !== "flagged") || data.zoneHistoryCount > zoneHistory.length) && (
            <div className="mt-4 border-t border-bead pt-3">
              <h3 className="mb-1 text-sm font-semibold">Zone corrections</h3>
              <ol className="space-y-1 text-sm" data-testid="defect-corrections">
                {zoneHistory.map((e) => (
                  <li key={e.id}>
                    <strong>
                      Zone {e.zone} {e.action}
                    </strong>
                    {e.what.length > 0 && <span className="text-ink-soft"> · {e.what.join(", ")}</span>}
                    <span className="text-ink-faint">
                      {" "}
                      · {e.by ?? "someone"} · {formatDateTime(e.at)}
                    </span>
                  </li>
                ))}
              </ol>
              {data.zoneHistoryCount > zoneHistory.length && (
                <MoreHistory shown={zoneHistory.length} total={data.zoneHistoryCount} all={all} href={allHref} />
              )}
            </div>
          )}
        </Card>

        <div className="grid gap-5 lg:grid-cols-2">
          <Card title="Lineage">
            <div className="space-y-2 text-sm">
              <p>
                {block.isOffcut ? (
                  <>
                    Cut from <Link href={`/stock/${encodeURIComponent(block.parentCode!)}`}>{block.parentCode}</Link>
                    {block.originInParent && (
                      <> at ({block.originInParent.map((v) => formatLength(v, unit)).join(", ")})</>
                    )}
                    .
                  </>
                ) : (
                  <>A whole block from lot {block.lot}.</>
                )}
              </p>
              {offcuts.length > 0 ? (
                <ul className="list-disc pl-5">
                  {offcuts.map((o) => (
                    <li key={o.id}>
                      <Link href={`/stock/${encodeURIComponent(o.code)}`}>{o.code}</Link> · {formatSize(o.size, unit)}
                    </li>
                  ))}
                </ul>
              ) : (
                <p className="text-ink-faint">No offcuts kept from it.</p>
              )}
            </div>
          </Card>
          <Card title="History">
            <ol className="space-y-2 text-sm" data-testid="block-history">
              {history.map((e) => (
                <li
                  key={e.id}
                  className="flex flex-wrap justify-between gap-2 border-b border-bead/60 pb-1 last:border-0"
                >
                  <span>
                    <strong>{LEDGER_LABELS[e.kind]}</strong>
                    {e.reason && <span className="text-ink-soft"> · {e.reason}</span>}
                  </span>
                  <span className="text-ink-faint">
                    {e.deltaM3 !== 0 && `${e.deltaM3 > 0 ? "+" : ""}${formatVolume(e.deltaM3)} · `}
                    {e.user ?? "system"} · {formatDate(e.at)}
                  </span>
                </li>
              ))}
            </ol>
            {data.historyCount > history.length && (
              <MoreHistory shown={history.length} total={data.historyCount} all={all} href={allHref} />
            )}
          </Card>
        </div>

        {/* The forms only for someone who may use them (they would draw nothing for anyone else). */}
        {(held ? canRelease : canHold) && (
          <HoldActions
            blockId={block.id}
            code={block.code}
            hold={held?.reason ?? null}
            canHold={canHold}
            canRelease={canRelease}
          />
        )}

        {(inStock || held !== null) && (canMove || canCorrect) && (
          <BlockActions
            blockId={block.id}
            code={block.code}
            location={block.location}
            size={block.size}
            canMove={canMove}
            canCorrect={canCorrect}
            inStock
          />
        )}
      </div>
    </>
  );
}

/** Under a list cut to its latest entries: how many there are and a link to them all. */
function MoreHistory({ shown, total, all, href }: { shown: number; total: number; all: boolean; href: string }) {
  return (
    <p className="mt-2 text-sm text-ink-faint">
      The latest {shown} of {total.toLocaleString("en")}.{" "}
      {!all && (
        <Link href={href} scroll={false}>
          Show all {total.toLocaleString("en")}
        </Link>
      )}
    </p>
  );
}
