import Link from "next/link";
import { cutterFigures, plannerFigures } from "@/db/queries/home";
import { isoDate } from "@/lib/stock";
import { formatVolume } from "@/lib/units";

export async function PlannerFigures() {
  const { jobs, ready } = await plannerFigures();
  const today = isoDate();
  return (
    <div className="mt-3 space-y-3 text-sm" data-testid="planner-figures">
      <div>
        <p className="text-xs uppercase tracking-wide text-ink-faint">Jobs due</p>
        {jobs.length ? (
          <ul className="mt-1">
            {jobs.map((j) => (
              <li key={j.id} className="flex items-center justify-between gap-2">
                <Link className="inline-flex min-h-11 min-w-11 items-center" href={`/jobs/${j.id}`}>
                  {j.name}
                </Link>
                <span className={j.dueOn && j.dueOn < today ? "font-semibold text-ember" : "text-ink-soft"}>
                  {j.owed} owed · {j.dueOn ?? "no date"}
                  {j.dueOn && j.dueOn < today && " · late"}
                </span>
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-ink-soft">No open jobs.</p>
        )}
      </div>
      <div>
        <p className="text-xs uppercase tracking-wide text-ink-faint">Ready to cut</p>
        <ul className="mt-1 flex flex-wrap gap-x-4 gap-y-1">
          {ready.map((r) => (
            <li key={r.grade}>
              <span className="mr-1 inline-block size-3 rounded-sm align-middle" style={{ background: r.colour }} />
              {r.grade}: {r.pieces} pcs · {formatVolume(r.m3, { digits: 1 })}
            </li>
          ))}
        </ul>
      </div>
    </div>
  );
}

export async function CutterFigures() {
  const plans = await cutterFigures();
  return (
    <div className="mt-3 text-sm" data-testid="cutter-figures">
      <p className="text-xs uppercase tracking-wide text-ink-faint">Approved plans to cut</p>
      {plans.length ? (
        <ul className="mt-1">
          {plans.map((p) => (
            <li key={p.id} className="flex items-center justify-between gap-2">
              <Link className="inline-flex min-h-11 min-w-11 items-center" href={`/plans/${p.id}/cut`}>
                Plan #{p.id} · {p.jobs.join(", ")}
              </Link>
              <span className="text-ink-soft">
                {p.toCut} block{p.toCut === 1 ? "" : "s"} to cut{p.cut ? `, ${p.cut} done` : ""}
              </span>
            </li>
          ))}
        </ul>
      ) : (
        <p className="text-ink-soft">Nothing approved yet.</p>
      )}
    </div>
  );
}
