import { Notice } from "@/components/ui/card";

/** The cutter's standing cautions. They defer to local codes, the SDS and licensed practice. */
export function HotWireCaution() {
  return (
    <Notice tone="caution" title="At the hot wire">
      <ul className="mt-1 list-disc space-y-0.5 pl-5">
        <li>
          Heated polystyrene gives off styrene: ventilate, and use the lowest wire heat that cuts. The wire should never
          smoke.
        </li>
        <li>The wire runs at 200–300 °C and may carry tens of volts. Never leave a hot wire unattended.</li>
        <li>Never hot-wire polyurethane (PU): it gives off isocyanates and hydrogen cyanide. Route or carve it.</li>
      </ul>
      <p className="mt-2 text-xs text-ink-soft">
        Follow your local codes, the material&apos;s safety data sheet and licensed practice; these notes do not replace
        them.
      </p>
    </Notice>
  );
}
