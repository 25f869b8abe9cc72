import Link from "next/link";
import { Notice } from "@/components/ui/card";
import { HIGH_PILED } from "@/lib/safety/limits";

/**
 * Where stock locations are shown: the fire load of stored foam and the high-piled storage limits
 * (NFPA 13 Group A; IFC 2018 ch. 32). Defers to the local fire authority and the SDS.
 */
export function StorageCaution({ compact = false }: { compact?: boolean }) {
  return (
    <Notice tone="caution" title="Stored foam is a fire load">
      <p>
        EPS and XPS burn, flame-retardant grades included; exposed foam is a Group A plastic, the highest storage
        hazard.
        {compact ? " " : <br />}
        Stacks over {HIGH_PILED.groupAPlasticsFt} ft ({Math.round(HIGH_PILED.groupAPlasticsFt * 0.3048 * 10) / 10} m)
        count as high-piled storage, and over {HIGH_PILED.permitAreaFt2} ft² of it needs a permit (IFC 2018 ch. 32).
        Keep fresh blocks ventilated: they give off pentane.
      </p>
      <p className="mt-1 text-xs text-ink-soft">
        Local editions differ: your fire authority, the material&apos;s safety data sheet and licensed practice decide.{" "}
        <Link href="/safety">Sources</Link>
      </p>
    </Notice>
  );
}
