import type { Metadata } from "next";
import { requirePage } from "@/lib/auth/guard";
import { Card, Notice, PageHeader } from "@/components/ui/card";
import { DEFER, HIGH_PILED, SAFETY_SOURCES, STYRENE } from "@/lib/safety/limits";

export const metadata: Metadata = { title: "Safety" };

export default async function SafetyPage() {
  await requirePage("/safety");
  return (
    <>
      <PageHeader
        title="Safety cautions and their sources"
        lead="The cautions Blockyard shows at the hot wire, on polyurethane grades and where stock is stored, with where each comes from."
      />
      <div className="mb-5">
        <Notice tone="caution">{DEFER}</Notice>
      </div>
      <div className="grid gap-5 lg:grid-cols-2">
        <Card title="Styrene limits">
          <table>
            <thead className="border-b border-bead">
              <tr>
                <th className="py-2">Limit</th>
                <th className="text-right">ppm</th>
                <th className="pl-6">Set by</th>
              </tr>
            </thead>
            <tbody>
              <tr className="border-b border-bead/60">
                <td className="py-2">Permissible exposure limit, 8-hour TWA</td>
                <td className="text-right tabular-nums" data-testid="osha-pel">
                  {STYRENE.oshaPelTwaPpm}
                </td>
                <td className="pl-6">OSHA</td>
              </tr>
              <tr className="border-b border-bead/60">
                <td className="py-2">Ceiling</td>
                <td className="text-right tabular-nums">{STYRENE.oshaCeilingPpm}</td>
                <td className="pl-6">OSHA</td>
              </tr>
              <tr className="border-b border-bead/60">
                <td className="py-2">Peak</td>
                <td className="text-right tabular-nums">{STYRENE.oshaPeakPpm}</td>
                <td className="pl-6">OSHA</td>
              </tr>
              <tr className="border-b border-bead/60">
                <td className="py-2">Recommended exposure limit, TWA</td>
                <td className="text-right tabular-nums" data-testid="niosh-rel">
                  {STYRENE.nioshRelTwaPpm}
                </td>
                <td className="pl-6">NIOSH</td>
              </tr>
              <tr className="border-b border-bead/60">
                <td className="py-2">Short-term exposure limit</td>
                <td className="text-right tabular-nums">{STYRENE.nioshStelPpm}</td>
                <td className="pl-6">NIOSH</td>
              </tr>
              <tr>
                <td className="py-2">Immediately dangerous to life or health</td>
                <td className="text-right tabular-nums" data-testid="idlh">
                  {STYRENE.idlhPpm}
                </td>
                <td className="pl-6">NIOSH</td>
              </tr>
            </tbody>
          </table>
        </Card>
        <Card title="Storage heights">
          <dl className="grid grid-cols-[1fr_auto] gap-x-4 gap-y-2 text-sm">
            <dt>High-piled storage, most goods</dt>
            <dd className="tabular-nums">over {HIGH_PILED.generalFt} ft</dd>
            <dt>High-piled storage, Group A plastics (foam)</dt>
            <dd className="tabular-nums">over {HIGH_PILED.groupAPlasticsFt} ft</dd>
            <dt>Permit needed for high-piled storage</dt>
            <dd className="tabular-nums">over {HIGH_PILED.permitAreaFt2} ft²</dd>
          </dl>
          <p className="mt-3 text-xs text-ink-faint">
            International Fire Code (2018), chapter 32. Local editions differ: ask your fire authority.
          </p>
        </Card>
      </div>
      <Card title="Every caution" className="mt-5">
        <ul className="divide-y divide-bead">
          {SAFETY_SOURCES.map((s) => (
            <li key={s.id} className="py-3 text-sm" id={s.id}>
              <p className="font-semibold">{s.topic}</p>
              <p className="mt-0.5">{s.caution}</p>
              <p className="mt-0.5 text-xs text-ink-faint">Source: {s.source}</p>
            </li>
          ))}
        </ul>
      </Card>
    </>
  );
}
