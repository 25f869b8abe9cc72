import type { Metadata } from "next";
import { requirePage } from "@/lib/auth/guard";
import { Card, Notice, PageHeader } from "@/components/ui/card";
import {
  DEFER,
  HIGH_PILED,
  PENTANE,
  PENTANE_LEL_PCT,
  SAFETY_SECTIONS,
  SAFETY_SOURCES,
  STYRENE,
  ppmToMgM3,
  type SafetySource,
} from "@/lib/safety/limits";

export const metadata: Metadata = { title: "Safety" };

// On paper: the cautions alone. The shell's menu and bars are `no-print`; its two-column grid
// would still leave an empty column, and cards print without shadows, whole where they fit.
const PRINT_CSS = `
@page { margin: 15mm; }
@media print {
  div:has(> aside.no-print) { display: block !important; }
  main { max-width: none !important; padding: 0 !important; margin: 0 !important; }
  .safety-page section { box-shadow: none !important; break-inside: avoid; }
  .safety-page a { color: inherit !important; text-decoration: none !important; }
}
`;

/** One row of an exposure-limit table. */
interface Limit {
  label: string;
  ppm: number;
  by: "OSHA" | "NIOSH";
  testId?: string;
}

const PENTANE_LIMITS: Limit[] = [
  { label: "Permissible exposure limit, 8-hour TWA", ppm: PENTANE.oshaPelTwaPpm, by: "OSHA" },
  { label: "Recommended exposure limit, TWA", ppm: PENTANE.nioshRelTwaPpm, by: "NIOSH" },
  { label: "Ceiling (15 minutes)", ppm: PENTANE.nioshCeilingPpm, by: "NIOSH" },
  { label: "Immediately dangerous to life or health (10 % of the LEL)", ppm: PENTANE.idlhPpm, by: "NIOSH" },
];

const LIMITS: Limit[] = [
  { label: "Permissible exposure limit, 8-hour TWA", ppm: STYRENE.oshaPelTwaPpm, by: "OSHA", testId: "osha-pel" },
  { label: "Ceiling", ppm: STYRENE.oshaCeilingPpm, by: "OSHA" },
  { label: "Peak", ppm: STYRENE.oshaPeakPpm, by: "OSHA" },
  { label: "Recommended exposure limit, TWA", ppm: STYRENE.nioshRelTwaPpm, by: "NIOSH", testId: "niosh-rel" },
  { label: "Short-term exposure limit", ppm: STYRENE.nioshStelPpm, by: "NIOSH" },
  { label: "Immediately dangerous to life or health", ppm: STYRENE.idlhPpm, by: "NIOSH", testId: "idlh" },
];

/** A substance's exposure limits in ppm and, converted at 25 °C and 1 atm, in mg/m³. */
function LimitTable({ limits, molarMass, testId }: { limits: Limit[]; molarMass: number; testId?: string }) {
  return (
    <table data-testid={testId}>
      <thead className="border-b border-bead">
        <tr>
          <th className="py-2 pr-3">Limit</th>
          <th className="px-3 py-2 text-right">ppm</th>
          <th className="px-3 py-2 text-right">mg/m³</th>
          <th className="py-2 pl-3">Set by</th>
        </tr>
      </thead>
      <tbody>
        {limits.map((l) => (
          <tr key={l.label} className="border-b border-bead/60 last:border-0">
            <td className="py-2 pr-3">{l.label}</td>
            <td className="px-3 py-2 text-right tabular-nums" data-testid={l.testId}>
              {l.ppm.toLocaleString("en")}
            </td>
            <td className="px-3 py-2 text-right tabular-nums">
              {Math.round(ppmToMgM3(l.ppm, molarMass)).toLocaleString("en")}
            </td>
            <td className="py-2 pl-3">{l.by}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function Caution({ s }: { s: SafetySource }) {
  return (
    <li className="py-3 text-sm first:pt-0 last:pb-0" id={s.id}>
      <p className="font-semibold">{s.topic}</p>
      <p className="mt-0.5">{s.caution}</p>
      <p className="mt-0.5 text-xs text-ink-faint">Source: {s.source}</p>
    </li>
  );
}

/** Open to anyone (PAGE_POLICY "public"): the cautions belong on the shop wall, printed. */
export default async function SafetyPage() {
  await requirePage("/safety");
  return (
    <div className="safety-page">
      <style>{PRINT_CSS}</style>
      <PageHeader
        title="Safety cautions and their sources"
        lead="The cautions Blockyard shows at the hot wire, on polyurethane grades and where stock is stored, with where each comes from."
      />
      <div className="mb-5">
        <Notice tone="caution">
          <p>{DEFER}</p>
          <p className="mt-1">
            Exposure limits differ by jurisdiction: this page shows United States values (OSHA, NIOSH). Use the limits
            that apply where you work.
          </p>
        </Notice>
      </div>
      <div className="grid gap-5 lg:grid-cols-2">
        <Card title="Styrene limits (United States)">
          <LimitTable limits={LIMITS} molarMass={STYRENE.molarMass} />
          <p className="mt-3 text-xs text-ink-faint">
            mg/m³ converted at 25 °C and 1 atm (ppm × {STYRENE.molarMass} ÷ 24.45); published tables round their own
            conversions and may differ by a few mg/m³. Other countries set their own limits.
          </p>
        </Card>
        <Card title="Pentane limits (United States)">
          <LimitTable limits={PENTANE_LIMITS} molarMass={PENTANE.molarMass} testId="pentane-limits" />
          <p className="mt-3 text-xs text-ink-faint">
            Fresh EPS gives off pentane as it cures. Source: NIOSH Pocket Guide to Chemical Hazards, n-pentane (values
            from memory; check the current edition). Its fire risk starts far below these: it burns in air from{" "}
            {PENTANE_LEL_PCT} % (15,000 ppm).
          </p>
        </Card>
        <Card title="Storage heights">
          <dl className="grid grid-cols-[1fr_auto] gap-x-4 gap-y-2 text-sm">
            <dt>High-piled storage, most goods</dt>
            <dd className="tabular-nums">over {HIGH_PILED.generalFt} ft</dd>
            <dt>
              High-piled storage, Group A plastics (foam, exposed or cartoned), where the fire code official requires it
            </dt>
            <dd className="tabular-nums">over {HIGH_PILED.groupAPlasticsFt} ft</dd>
            <dt>Permit needed for high-piled storage</dt>
            <dd className="tabular-nums">over {HIGH_PILED.permitAreaFt2} ft²</dd>
          </dl>
          <p className="mt-3 text-xs text-ink-faint">
            International Fire Code (2018), chapter 32. Local editions differ: ask your fire authority.
          </p>
        </Card>
      </div>
      <div className="mt-5 grid gap-5 lg:grid-cols-2">
        {SAFETY_SECTIONS.map((section) => (
          <Card key={section.id} title={section.title}>
            <ul className="divide-y divide-bead">
              {SAFETY_SOURCES.filter((s) => s.section === section.id).map((s) => (
                <Caution key={s.id} s={s} />
              ))}
            </ul>
          </Card>
        ))}
      </div>
      <p className="mt-5 text-sm text-ink-soft">
        Where a source says &ldquo;common practice, no source&rdquo;, the caution is the trade&apos;s usual practice and
        Blockyard names no standard for it. Your local codes, the material&apos;s safety data sheet and licensed
        practice come first.
      </p>
    </div>
  );
}
