import type { Metadata } from "next";
import { requirePage } from "@/lib/auth/guard";
import { allows } from "@/lib/auth/policy";
import { displayUnit } from "@/lib/display";
import { PageHeader } from "@/components/ui/card";
import { FlagDefect } from "@/components/stock/flag-defect";

export const metadata: Metadata = { title: "Flag a defect" };

export default async function FlagDefectPage({
  searchParams,
}: {
  searchParams: Promise<{ code?: string | string[] }>;
}) {
  const user = await requirePage("/defects/new");
  const unit = await displayUnit(user);
  const { code } = await searchParams;
  const initial = typeof code === "string" ? code.slice(0, 40) : undefined;
  return (
    <>
      <PageHeader
        title="Flag a defect"
        lead="Find the block, mark the zone on one of its faces, say what it is and add a photo. Planners keep parts clear of it from then on."
      />
      <FlagDefect
        initialCode={initial}
        unit={unit}
        viewer={{ id: user.id, planner: allows(["planner"], user.roles) }}
      />
    </>
  );
}
