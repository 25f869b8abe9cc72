import type { Machine } from "@/lib/planning/machine";
import { dims, mm } from "@/lib/planning/machine";
import type { Next, Step } from "@/lib/planning/procedure";
import { placementFrame } from "@/lib/planning/wire-path";

const AX = { x: 0, y: 1, z: 2 } as const;

/** What a piece leaving the table is, in a few words. */
export function describeNext(n: Next, partName: (k: string) => string, offcutCodes: readonly string[]): string {
  switch (n.what.kind) {
    case "part":
      // A slab of a true-shape plan goes on to the profile cutter, which cuts its parts out.
      return n.what.part.startsWith("slab-")
        ? `${partName(n.what.part)} → profile cutter`
        : `${partName(n.what.part)} → part bin`;
    case "offcut":
      return `offcut ${offcutCodes[n.what.index] ?? `#${n.what.index + 1}`} → offcut rack`;
    case "scrap":
      return "scrap";
    case "step":
      return `piece ${n.what.piece} → step ${n.what.step}`;
  }
}

/**
 * One placement as the cutter sees it from the front of the machine: the piece on the table (X to
 * the right, Y up), every cut of the step as its kerf's centre line, the current cut drawn thick
 * and numbered large, and what each piece becomes. Other cut numbers are drawn only where they
 * have room; the list beside the drawing always has them all.
 */
export function StepDrawing({
  step,
  machine,
  kerf,
  current,
  partName,
  offcutCodes,
}: {
  step: Step;
  machine: Machine;
  kerf: number;
  current: number | null;
  partName: (k: string) => string;
  offcutCodes: readonly string[];
}) {
  const f = placementFrame(step, machine);
  const w = f.right;
  const h = f.top;
  // Text in drawing units: about 1/32 of the longer side, so ~22 px on a 720 px wide drawing.
  const font = Math.max(w, h) / 32;
  const pad = font * 2.4;
  const Y = (v: number) => h - v; // up is up
  const lines = step.cuts.map((c) => {
    const a = AX[c.axis];
    const mid = f.local(a, c.at + kerf / 2);
    const other = c.machineAxis === "X" ? f.ay : f.ax;
    const lo = f.local(other, c.region.origin[other]!);
    const hi = f.local(other, c.region.origin[other]! + c.region.size[other]!);
    return c.machineAxis === "X"
      ? { n: c.n, x1: mid, y1: lo, x2: mid, y2: hi, vertical: true, mid }
      : { n: c.n, x1: lo, y1: mid, x2: hi, y2: mid, vertical: false, mid };
  });
  // A number has room when no parallel cut line of this step lies within 1.5 font sizes of it.
  const roomy = (l: (typeof lines)[number]) =>
    !lines.some((o) => o !== l && o.vertical === l.vertical && Math.abs(o.mid - l.mid) < font * 1.5);
  const pieces = step.next.map((n, i) => {
    const x0 = f.local(f.ax, n.box.origin[f.ax]!);
    const x1 = f.local(f.ax, n.box.origin[f.ax]! + n.box.size[f.ax]!);
    const y0 = f.local(f.ay, n.box.origin[f.ay]!);
    const y1 = f.local(f.ay, n.box.origin[f.ay]! + n.box.size[f.ay]!);
    return { i, n, x0, x1, y0, y1 };
  });
  const fill = (n: Next) =>
    n.what.kind === "part"
      ? "var(--color-kerf-light, #d9eef0)"
      : n.what.kind === "offcut"
        ? "#efe6c8"
        : n.what.kind === "step"
          ? "#e4e8f3"
          : "#e2e0dc";
  const cur = lines.find((l) => l.n === current);
  // A short name inside each piece: the part, "offcut .3", "piece B", or nothing for scrap.
  const label = (n: Next) =>
    n.what.kind === "part"
      ? partName(n.what.part)
      : n.what.kind === "offcut"
        ? `offcut ${(offcutCodes[n.what.index] ?? `#${n.what.index + 1}`).replace(/^.*(\.\d+)$/, "$1")}`
        : n.what.kind === "step"
          ? `piece ${n.what.piece}`
          : "";
  const title = `Step ${step.n}: piece ${step.piece}, ${dims(step.size)} mm, ${step.cuts.length} cut${step.cuts.length === 1 ? "" : "s"}`;
  return (
    <figure className="space-y-1">
      <figcaption className="text-sm text-ink-soft">
        Seen from the front: {mm(step.placed[0])} mm along {machine.dialect.axes[0]} · {mm(step.placed[2])} mm{" "}
        {f.horizontal ? "high" : `along ${machine.dialect.axes[1]}`} · {mm(step.placed[1])} mm along the wire.
        {current !== null && ` Cut ${current} in red.`}
      </figcaption>
      <svg
        role="img"
        aria-labelledby={`step-${step.n}-title`}
        viewBox={`${-pad} ${-pad} ${w + 2 * pad} ${h + 2 * pad}`}
        className="h-auto w-full max-h-[60vh] rounded-md border border-bead bg-paper-raised"
      >
        <title id={`step-${step.n}-title`}>{title}</title>
        {/* The table (horizontal wire) */}
        {f.horizontal && <rect x={-pad} y={Y(0)} width={w + 2 * pad} height={pad} fill="#cfc9bd" />}
        <rect
          x={f.min[0]}
          y={Y(f.max[1])}
          width={f.max[0] - f.min[0]}
          height={f.max[1] - f.min[1]}
          fill="#fbfaf7"
          stroke="#5b5750"
          strokeWidth={font / 8}
        />
        {pieces.map((p) => (
          <g key={p.i}>
            <rect
              x={p.x0}
              y={Y(p.y1)}
              width={p.x1 - p.x0}
              height={p.y1 - p.y0}
              fill={fill(p.n)}
              stroke="#8a857c"
              strokeWidth={font / 14}
            />
            {p.x1 - p.x0 > label(p.n).length * font * 0.5 + font && p.y1 - p.y0 > font * 1.6 && (
              <text
                x={(p.x0 + p.x1) / 2}
                y={Y((p.y0 + p.y1) / 2) + font / 3}
                fontSize={font * 0.8}
                textAnchor="middle"
                fill="#3d3a35"
              >
                {label(p.n)}
              </text>
            )}
          </g>
        ))}
        {lines.map((l) => (
          <line
            key={l.n}
            x1={l.x1}
            y1={Y(l.y1)}
            x2={l.x2}
            y2={Y(l.y2)}
            stroke={l.n === current ? "#b4461b" : "#6c675f"}
            strokeWidth={l.n === current ? font / 3 : font / 10}
            strokeDasharray={l.n === current ? undefined : `${font / 2} ${font / 4}`}
          />
        ))}
        {lines
          .filter((l) => l.n !== current && roomy(l))
          .map((l) => (
            <text
              key={`n${l.n}`}
              x={l.vertical ? l.mid : l.x1 - font * 0.3}
              y={l.vertical ? Y(l.y2) - font * 0.3 : Y(l.mid) + font / 3}
              fontSize={font * 0.8}
              textAnchor={l.vertical ? "middle" : "end"}
              fill="#3d3a35"
            >
              {l.n}
            </text>
          ))}
        {cur && (
          <g>
            <circle
              cx={cur.vertical ? cur.mid : cur.x1 - font}
              cy={cur.vertical ? Y(cur.y2) - font : Y(cur.mid)}
              r={font * 0.95}
              fill="#b4461b"
            />
            <text
              x={cur.vertical ? cur.mid : cur.x1 - font}
              y={(cur.vertical ? Y(cur.y2) - font : Y(cur.mid)) + font * 0.4}
              fontSize={font * 1.1}
              fontWeight={700}
              textAnchor="middle"
              fill="#fff"
            >
              {cur.n}
            </text>
          </g>
        )}
      </svg>
    </figure>
  );
}
