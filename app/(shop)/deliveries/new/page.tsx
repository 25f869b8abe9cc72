import type { Metadata } from "next";
import { requirePage } from "@/lib/auth/guard";
import { listSuppliers } from "@/db/queries/suppliers";
import { listGrades } from "@/db/queries/grades";
import { displayUnit } from "@/lib/display";
import { PageHeader } from "@/components/ui/card";
import { ReceiveForm } from "@/components/stock/receive-form";

export const metadata: Metadata = { title: "Receive a delivery" };

export default async function ReceivePage() {
  const user = await requirePage("/deliveries/new");
  const [suppliers, grades, unit] = await Promise.all([listSuppliers(), listGrades(), displayUnit(user)]);
  return (
    <>
      <PageHeader
        title="Receive a delivery"
        lead="Measure and weigh each block as it comes off the truck. Blockyard works out density and the date it may be cut. Leave a code blank and Blockyard numbers the block; a code of your own takes letters, digits and “-”."
      />
      <ReceiveForm
        suppliers={suppliers.filter((s) => s.active).map((s) => ({ id: s.id, name: s.name }))}
        grades={grades
          .filter((g) => g.active)
          .map((g) => ({
            id: g.id,
            code: g.code,
            minDensity: g.minDensity,
            cureDays: g.cureDays,
            neverHotWire: g.neverHotWire,
          }))}
        unit={unit}
      />
    </>
  );
}
