import type { LengthUnit } from "@/lib/units";

/**
 * On the pages used at the machine (cut sheet, at the machine), for someone who reads inches: sizes
 * carry inches beside the millimetres (`formatMachineSize`), positions stay in mm. Nothing for mm.
 */
export function MachineUnitsNote({ unit }: { unit: LengthUnit }) {
  if (unit !== "in") return null;
  return (
    <p className="text-sm text-ink-soft">
      Sizes are given in inches too; every position stays in millimetres, as the machines are driven.
    </p>
  );
}
