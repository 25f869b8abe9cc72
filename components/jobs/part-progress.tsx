import type { PartProgress } from "@/db/queries/owed";

/** Per part line: how many were ordered, cut good, rejected at the machine, and are still owed. */
export function PartProgressTable({ rows }: { rows: PartProgress[] }) {
  const sum = (k: "ordered" | "cut" | "rejected" | "owed") => rows.reduce((s, r) => s + r[k], 0);
  return (
    <div className="overflow-x-auto">
      <table data-testid="job-part-progress">
        <caption className="sr-only">Cutting progress per part</caption>
        <thead className="border-b border-bead">
          <tr>
            <th scope="col" className="py-2 pr-3">
              Part
            </th>
            <th scope="col" className="pr-3">
              Grade
            </th>
            <th scope="col" className="pr-3 text-right">
              Ordered
            </th>
            <th scope="col" className="pr-3 text-right">
              Cut
            </th>
            <th scope="col" className="pr-3 text-right">
              Rejected
            </th>
            <th scope="col" className="pr-3 text-right">
              Owed
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.partId} className="border-b border-bead/60" data-testid={`progress-${r.partId}`}>
              <th scope="row" className="py-2 pr-3 font-medium wrap-anywhere">
                {r.name}
              </th>
              <td className="pr-3">{r.gradeCode ?? "–"}</td>
              <td className="pr-3 text-right tabular-nums">{r.ordered}</td>
              <td className="pr-3 text-right tabular-nums">{r.cut}</td>
              <td className={`pr-3 text-right tabular-nums ${r.rejected > 0 ? "text-ember" : ""}`}>{r.rejected}</td>
              <td className={`pr-3 text-right tabular-nums ${r.owed > 0 ? "font-semibold" : "text-ink-soft"}`}>
                {r.owed > 0 ? r.owed : "0 (done)"}
              </td>
            </tr>
          ))}
        </tbody>
        <tfoot>
          <tr>
            <th scope="row" className="py-2 pr-3">
              Total
            </th>
            <td />
            <td className="pr-3 text-right tabular-nums">{sum("ordered")}</td>
            <td className="pr-3 text-right tabular-nums">{sum("cut")}</td>
            <td className="pr-3 text-right tabular-nums">{sum("rejected")}</td>
            <td className="pr-3 text-right font-semibold tabular-nums">{sum("owed")}</td>
          </tr>
        </tfoot>
      </table>
      <p className="mt-2 text-xs text-ink-faint">
        Cut counts good pieces recorded at the machine; rejected pieces are owed again. Owed = ordered − cut.
      </p>
    </div>
  );
}
