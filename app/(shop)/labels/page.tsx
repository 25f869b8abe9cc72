import type { Metadata } from "next";
import Link from "next/link";
import QRCode from "qrcode";
import { requirePage } from "@/lib/auth/guard";
import { displayUnit } from "@/lib/display";
import { getBlock, recentCodes, type BlockDetail } from "@/db/queries/blocks";
import { getShopSettings } from "@/db/queries/settings";
import { labelPayload } from "@/lib/block-code";
import { formatSize, type LengthUnit } from "@/lib/units";
import { Card, Notice, PageHeader } from "@/components/ui/card";
import { buttonClass } from "@/components/ui/button";
import { PrintButton } from "@/components/stock/print-button";

export const metadata: Metadata = { title: "Labels" };

const MAX_LABELS = 120; // fifteen sheets of eight
/** Quick picks: what came into stock in the last week. */
const RECENT_DAYS = 7;

/** "HF-1001, hf-1002 HF-1001" → ["HF-1001", "HF-1002"] */
function parseCodes(raw: string | string[] | undefined): string[] {
  const text = Array.isArray(raw) ? raw.join(",") : (raw ?? "");
  return [
    ...new Set(
      text
        .split(/[\s,;]+/)
        .map((c) => c.trim().toUpperCase())
        .filter((c) => c && c.length <= 40),
    ),
  ];
}

const escapeAttr = (s: string) => s.replace(/&/g, "&amp;").replace(/"/g, "&quot;").replace(/</g, "&lt;");

/** The QR code as inline SVG, drawn on the server in the ink colour (never a remote image). */
async function qrSvg(code: string): Promise<string> {
  const svg = await QRCode.toString(labelPayload(code), {
    type: "svg",
    errorCorrectionLevel: "M",
    margin: 0,
    color: { dark: "#1c2a2eff", light: "#ffffffff" },
  });
  return svg.replace(
    "<svg ",
    `<svg role="img" aria-label="QR code for ${escapeAttr(code)}" data-testid="label-qr" class="block size-full" `,
  );
}

// Eight labels of 90 × 60 mm on a sheet: two columns of four fit both A4 and US Letter with
// 10 mm margins. The shell's navigation is `no-print`; here the page itself drops its toolbar.
const PRINT_CSS = `
@page { size: auto; margin: 10mm; }
@media print {
  /* The shell keeps its two-column grid even with the navigation hidden: one column on paper. */
  div:has(> aside.no-print) { display: block !important; }
  main { max-width: none !important; padding: 0 !important; margin: 0 !important; }
  .label-sheet { gap: 4mm 6mm !important; padding: 0 !important; background: none !important; border: 0 !important; box-shadow: none !important; }
  .label-card { border: 0.25mm dashed #9aa4a6 !important; box-shadow: none !important; }
}
.label-card { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
`;

export default async function LabelsPage({ searchParams }: { searchParams: Promise<{ codes?: string | string[] }> }) {
  const user = await requirePage("/labels");
  const unit = await displayUnit(user);
  const asked = parseCodes((await searchParams).codes);
  const codes = asked.slice(0, MAX_LABELS);
  const found = await Promise.all(codes.map(async (c) => ({ code: c, block: await getBlock(c) })));
  const blocks = found.flatMap((f) => (f.block ? [f.block] : []));
  const missing = found.filter((f) => !f.block).map((f) => f.code);
  const qrs = await Promise.all(blocks.map((b) => qrSvg(b.code)));
  const shop = (await getShopSettings()).shopName;
  const [recentOffcuts, recentBlocks] = asked.length
    ? [[], []]
    : await Promise.all([
        recentCodes("offcuts", RECENT_DAYS, MAX_LABELS),
        recentCodes("received", RECENT_DAYS, MAX_LABELS),
      ]);
  const pick = (codes: string[]) => `/labels?codes=${encodeURIComponent(codes.join(","))}`;

  return (
    <>
      <style>{PRINT_CSS}</style>
      <div className="no-print">
        <PageHeader
          title="Labels"
          lead="One label per block or offcut: the QR code holds the block code, so a tablet finds the block in one scan. Eight to a sheet, A4 or Letter."
          actions={blocks.length > 0 ? <PrintButton /> : undefined}
        />
        <div className="mb-5 space-y-3">
          {missing.length > 0 && (
            <Notice tone="caution" title={`${missing.length} code${missing.length === 1 ? "" : "s"} not found`}>
              No block has the code {missing.join(", ")}; no label was made for {missing.length === 1 ? "it" : "them"}.
            </Notice>
          )}
          {asked.length > MAX_LABELS && (
            <Notice tone="caution">
              Only the first {MAX_LABELS} labels are shown; print the rest in another batch.
            </Notice>
          )}
          <Card>
            <form method="get" action="/labels" className="flex flex-wrap items-end gap-3">
              <div className="min-w-64 flex-1 space-y-1">
                <label htmlFor="codes" className="block text-sm font-medium text-ink-soft">
                  Block codes
                </label>
                <input
                  id="codes"
                  name="codes"
                  defaultValue={asked.join(", ")}
                  placeholder="HF-1001, HF-1002.1"
                  className="block min-h-11 w-full rounded-md border border-bead-strong bg-paper-raised px-3 text-base focus:border-kerf focus:ring-2 focus:ring-kerf focus:outline-none"
                />
              </div>
              <button type="submit" className={buttonClass("secondary")}>
                Show labels
              </button>
            </form>
            {(recentOffcuts.length > 0 || recentBlocks.length > 0) && (
              <div className="mt-4 flex flex-wrap items-center gap-2 border-t border-bead pt-4 text-sm">
                <span className="text-ink-soft">In stock since {RECENT_DAYS} days ago:</span>
                {recentOffcuts.length > 0 && (
                  <Link className={buttonClass("secondary")} href={pick(recentOffcuts)}>
                    {recentOffcuts.length} {recentOffcuts.length === 1 ? "offcut" : "offcuts"} cut
                  </Link>
                )}
                {recentBlocks.length > 0 && (
                  <Link className={buttonClass("secondary")} href={pick(recentBlocks)}>
                    {recentBlocks.length} {recentBlocks.length === 1 ? "block" : "blocks"} received
                  </Link>
                )}
              </div>
            )}
          </Card>
        </div>
      </div>

      {blocks.length > 0 ? (
        <section
          aria-label="Labels to print"
          className="label-sheet grid justify-center gap-4 rounded-card border border-bead bg-paper-sunk p-4 [grid-template-columns:repeat(auto-fill,90mm)] print:[grid-template-columns:repeat(2,90mm)]"
        >
          {blocks.map((b, i) => (
            <Label key={b.id} block={b} qr={qrs[i]!} unit={unit} shop={shop} />
          ))}
        </section>
      ) : (
        <p className="no-print text-ink-faint">
          Type the codes of the blocks to label, or use “Print label” on a block page.
        </p>
      )}
    </>
  );
}

/** The code is what people read from across the bay: as large as its length allows, never cut short. */
function codeSize(code: string): string {
  if (code.length <= 8) return "26pt";
  if (code.length <= 10) return "21pt";
  if (code.length <= 13) return "17pt";
  return "13pt";
}

function Label({ block: b, qr, unit, shop }: { block: BlockDetail; qr: string; unit: LengthUnit; shop: string }) {
  return (
    <article
      data-testid="label"
      aria-label={`Label for ${b.code}`}
      className="label-card relative flex h-[60mm] w-[90mm] break-inside-avoid overflow-hidden rounded-[2mm] bg-white text-ink shadow-card"
      style={{ borderLeft: `3mm solid ${b.colour}` }}
    >
      <div className="flex w-[34mm] shrink-0 flex-col items-center justify-center gap-[2mm] pl-[3mm]">
        <div className="size-[29mm]" dangerouslySetInnerHTML={{ __html: qr }} />
        <p className="w-[29mm] truncate text-center text-[6.5pt] leading-none text-ink-faint">{shop}</p>
      </div>
      <div className="flex min-w-0 flex-1 flex-col py-[4mm] pr-[3.5mm] pl-[2.5mm]">
        <p
          className="leading-[1.05] font-bold tracking-tight break-all"
          style={{ fontSize: codeSize(b.code), fontVariantNumeric: "tabular-nums" }}
        >
          {b.code}
        </p>
        <p className="mt-[1.5mm] truncate text-[11pt] leading-tight font-semibold">{b.gradeCode}</p>
        <p className="truncate text-[8.5pt] leading-tight text-ink-soft">{b.gradeLabel}</p>
        <p className="mt-[1mm] text-[10.5pt] leading-tight" style={{ fontVariantNumeric: "tabular-nums" }}>
          {formatSize(b.size, unit)}
        </p>
        <p className="truncate text-[9pt] leading-tight text-ink-soft">Lot {b.lot}</p>
        {b.parentCode && (
          <p className="truncate text-[9pt] leading-tight font-medium text-ink-soft">Offcut of {b.parentCode}</p>
        )}
        {b.neverHotWire && <p className="mt-[1mm] text-[8.5pt] font-bold text-ember uppercase">Never hot-wire</p>}
        <p className="mt-auto truncate pt-[1mm] text-[7.5pt] text-ink-faint">Ready to cut from {b.cutNotBefore}</p>
      </div>
    </article>
  );
}
