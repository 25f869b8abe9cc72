/**
 * A block of a plan, drawn to scale: top (length × width), front (length × height) and side
 * (width × height) views, then one top view per layer. Parts are labelled, defect zones shaded,
 * offcuts outlined, and the through cuts numbered in the order they are made. Beside the drawings,
 * the same facts as text (every cut and every part), for people who cannot see the drawing and for
 * plans too busy to number. Pure markup: renders on the server and in the browser alike.
 *
 * Drawing text is set in the drawing's own units and the drawing fills its column (one column on a
 * tablet), so labels and cut numbers are at least 12 units ≈ 13–19 px as shown; cut numbers are a
 * darker orange (5.6:1 on the block's paper colour, WCAG 2.1 AA for text).
 */
import { plural } from "@/lib/format";
import { cutRegions, type RegionCut } from "@/lib/planning/cut-regions";
import type { Vec3 } from "@/lib/nesting";
import { formatLength, formatSize, lengthNumber, type LengthUnit } from "@/lib/units";

type V3 = Vec3;

export interface PlanViewProps {
  block: { id: string; size: V3; defects: { min: V3; max: V3 }[] };
  placements: { part: string; origin: V3; size: V3 }[];
  offcuts: { origin: V3; size: V3 }[];
  cuts: { axis: "x" | "y" | "z"; at: number }[];
  kerf: number;
  /** Face trim of this block (0 for offcuts), to place the first cuts inside the trimmed faces. */
  trim?: number;
  partName: (key: string) => string;
  showLayers?: boolean;
  /** The text list of cuts and parts under the drawings (on by default). */
  facts?: boolean;
  /** The reader's length unit for the drawing's dimensions and the text list (millimetres by default). */
  unit?: LengthUnit;
}

const AX = { x: 0, y: 1, z: 2 } as const;
const PALETTE = ["#d7ecee", "#e0efe3", "#f6ecd2", "#efe0f3", "#e3e7f6", "#fbe6da"];
/** Cut lines keep the hot-wire orange; their numbers are a darker orange that reads as text. */
const CUT_LINE = "#d2571f";
const CUT_TEXT = "#a8401a";
/** The smallest drawing text, in drawing units (the drawing is never shown smaller than its units). */
export const DRAWING_TEXT = 12;
/** Up to this many cuts are numbered on the drawings; busier plans number them in the list below. */
const NUMBERED_CUTS = 30;
/** At most this many rows of each text list; the cut sheet lists every one. */
const LIST_ROWS = 400;

/** A view at least this many times longer than high takes a whole row (drawn larger). */
const LONG_VIEW = 2.5;

/** Drawing coordinates to a tenth of a pixel: the same picture, far shorter markup for big plans. */
const px1 = (v: number): number => Math.round(v * 10) / 10;

function View({
  title,
  a,
  b,
  props,
  regions,
  only,
  zRange,
  width = 360,
  className = "",
}: {
  title: string;
  a: 0 | 1 | 2;
  b: 0 | 1 | 2;
  props: PlanViewProps;
  regions: RegionCut[];
  only?: PlanViewProps["placements"];
  zRange?: [number, number];
  width?: number;
  className?: string;
}) {
  const { block } = props;
  const W = block.size[a];
  const H = block.size[b];
  const scale = width / Math.max(W, H * 1.6);
  const w = W * scale;
  const h = H * scale;
  const pad = 26;
  const X = (v: number) => px1(pad + v * scale);
  const Y = (v: number) => px1(pad + h - v * scale); // up is up
  const nameIndex = new Map<string, number>();
  for (const p of props.placements) if (!nameIndex.has(p.part)) nameIndex.set(p.part, nameIndex.size);
  // Pieces stacked behind one another along the line of sight draw the same rectangle: draw it once
  // (a block of 4,000 small parts has a few hundred columns seen from the top).
  const seen = new Set<string>();
  const placements = (only ?? props.placements).filter((p) => {
    const key = `${p.part}|${px1(p.origin[a] * scale)}|${px1(p.origin[b] * scale)}|${px1(p.size[a] * scale)}|${px1(p.size[b] * scale)}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
  const labelled = props.cuts.length <= NUMBERED_CUTS;
  // Text grows with the drawing's own width: a long view drawn 960 units wide is shown about as
  // wide as a short one's column, so its text is set larger in its units to read the same.
  const fs = px1(DRAWING_TEXT * Math.max(1, (w + pad * 2) / 700));
  // A layer shows the cuts through its own height; unnumbered, a cut line drawn already is not drawn again.
  const drawn = new Set<string>();
  const cutAxes = regions.filter((c) => {
    if (AX[c.axis] !== a && AX[c.axis] !== b) return false;
    if (zRange && (c.region.max[2]! <= zRange[0] || c.region.min[2]! >= zRange[1])) return false;
    if (labelled) return true;
    const key = `${c.axis}|${px1(c.at * scale)}|${px1(c.region.min[a]! * scale)}|${px1(c.region.max[a]! * scale)}|${px1(c.region.min[b]! * scale)}|${px1(c.region.max[b]! * scale)}`;
    if (drawn.has(key)) return false;
    drawn.add(key);
    return true;
  });
  return (
    <figure className={`space-y-1 ${className}`}>
      <figcaption className="text-xs font-medium uppercase tracking-wide text-ink-faint">{title}</figcaption>
      <svg
        viewBox={`0 0 ${w + pad * 2} ${h + pad * 2}`}
        className="w-full"
        style={{ minWidth: Math.min(w + pad * 2, 280) }}
        role="img"
        aria-label={`${title} of ${block.id}`}
      >
        <title>{`${title} of ${block.id}: ${plural(placements.length, "part")}, ${plural(cutAxes.length, "cut")} seen from here; the lists below say the same in words`}</title>
        <rect x={X(0)} y={Y(H)} width={w} height={h} fill="#f7f5ef" stroke="#1c2a2e" strokeWidth={1.5} />
        {props.offcuts.map((o, i) => (
          <rect
            key={`o${i}`}
            x={X(o.origin[a])}
            y={Y(o.origin[b] + o.size[b])}
            width={px1(o.size[a] * scale)}
            height={px1(o.size[b] * scale)}
            fill="#e0efe3"
            fillOpacity={0.5}
            stroke="#3b7a4a"
            strokeDasharray="5 3"
            strokeWidth={1.2}
          />
        ))}
        {placements.map((p, i) => {
          const px = X(p.origin[a]);
          const py = Y(p.origin[b] + p.size[b]);
          const pw = px1(p.size[a] * scale);
          const ph = px1(p.size[b] * scale);
          const label = props.partName(p.part);
          return (
            <g key={`p${i}`}>
              <rect
                x={px}
                y={py}
                width={pw}
                height={ph}
                fill={PALETTE[(nameIndex.get(p.part) ?? 0) % PALETTE.length]}
                fillOpacity={0.85}
                stroke="#1f6c75"
                strokeWidth={0.8}
              />
              {pw > fs * 3.4 && ph > fs + 2 && (
                <text
                  x={px1(px + pw / 2)}
                  y={px1(py + ph / 2)}
                  fontSize={fs}
                  textAnchor="middle"
                  dominantBaseline="middle"
                  fill="#16525a"
                >
                  {label.length > pw / (fs * 0.6)
                    ? `${label.slice(0, Math.max(2, Math.floor(pw / (fs * 0.6))))}…`
                    : label}
                </text>
              )}
            </g>
          );
        })}
        {block.defects.map((d, i) => (
          <rect
            key={`d${i}`}
            x={X(d.min[a])}
            y={Y(d.max[b])}
            width={px1((d.max[a] - d.min[a]) * scale)}
            height={px1((d.max[b] - d.min[b]) * scale)}
            fill="#a8322a"
            fillOpacity={0.35}
            stroke="#a8322a"
            strokeWidth={1}
          />
        ))}
        {cutAxes.map((c) => {
          const pos = c.at + props.kerf / 2;
          const vertical = AX[c.axis] === a;
          // The wire crosses only the piece this cut splits.
          const span = vertical ? [c.region.min[b]!, c.region.max[b]!] : [c.region.min[a]!, c.region.max[a]!];
          return vertical ? (
            <g key={`c${c.n}`}>
              <line x1={X(pos)} x2={X(pos)} y1={Y(span[0]!)} y2={Y(span[1]!)} stroke={CUT_LINE} strokeWidth={1.1} />
              {labelled && (
                <text x={X(pos)} y={Y(span[1]!) - 3} fontSize={fs} textAnchor="middle" fill={CUT_TEXT} fontWeight={600}>
                  {c.n}
                </text>
              )}
            </g>
          ) : (
            <g key={`c${c.n}`}>
              <line x1={X(span[0]!)} x2={X(span[1]!)} y1={Y(pos)} y2={Y(pos)} stroke={CUT_LINE} strokeWidth={1.1} />
              {labelled && (
                <text
                  x={X(span[1]!) + 3}
                  y={Y(pos)}
                  fontSize={fs}
                  dominantBaseline="middle"
                  fill={CUT_TEXT}
                  fontWeight={600}
                >
                  {c.n}
                </text>
              )}
            </g>
          );
        })}
        <text x={X(W / 2)} y={Y(0) + fs + 4} fontSize={fs} textAnchor="middle" fill="#3d4f54">
          {formatLength(W, props.unit ?? "mm")}
        </text>
        <text
          x={X(0) - 8}
          y={Y(H / 2)}
          fontSize={fs}
          textAnchor="middle"
          fill="#3d4f54"
          transform={`rotate(-90 ${X(0) - 8} ${Y(H / 2)})`}
        >
          {formatLength(H, props.unit ?? "mm")}
        </text>
      </svg>
    </figure>
  );
}

const VIEWS: [string, 0 | 1 | 2, 0 | 1 | 2][] = [
  ["Top (length × width)", 0, 1],
  ["Front (length × height)", 0, 2],
  ["Side (width × height)", 1, 2],
];

export function PlanView(props: PlanViewProps) {
  // Which piece of foam each cut crosses: worked out once for all the views of the block.
  const pieces = [...props.placements, ...props.offcuts].map((p) => ({
    min: p.origin,
    max: p.origin.map((v, i) => v + p.size[i]!) as V3,
  }));
  const regions = cutRegions(props.block.size, props.cuts, props.trim ?? 0, props.kerf, pieces);
  const layers = new Map<string, PlanViewProps["placements"]>();
  for (const p of props.placements) {
    const key = `${p.origin[2]}|${p.origin[2] + p.size[2]}`;
    layers.set(key, [...(layers.get(key) ?? []), p]);
  }
  const sorted = [...layers.entries()].sort((x, y) => Number(x[0].split("|")[0]) - Number(y[0].split("|")[0]));
  return (
    <div className="space-y-4">
      {/* Long views (a long block's top and front) take a whole row at a larger scale, so thin
          pieces stay readable; the others share a row. */}
      <div className="grid gap-4 lg:grid-cols-2">
        {VIEWS.map(([title, a, b]) => {
          const long = props.block.size[a] >= LONG_VIEW * props.block.size[b];
          return (
            <View
              key={title}
              title={title}
              a={a}
              b={b}
              props={props}
              regions={regions}
              width={long ? 960 : 420}
              className={long ? "lg:col-span-2" : ""}
            />
          );
        })}
      </div>
      {props.showLayers !== false && sorted.length > 1 && (
        <details className="rounded-md border border-bead p-3">
          <summary className="cursor-pointer py-3 text-sm font-medium">
            Layers ({sorted.length}), from the bottom
          </summary>
          <div className="mt-3 grid gap-4 sm:grid-cols-2">
            {sorted.map(([key, ps], i) => {
              const [lo, hi] = key.split("|").map(Number);
              return (
                <View
                  key={key}
                  title={`Layer ${i + 1}: z ${lengthNumber(lo!, props.unit ?? "mm")}–${formatLength(hi!, props.unit ?? "mm")}`}
                  a={0}
                  b={1}
                  props={props}
                  regions={regions}
                  only={ps}
                  zRange={[lo!, hi!]}
                  width={300}
                />
              );
            })}
          </div>
        </details>
      )}
      <p className="flex flex-wrap gap-4 text-xs text-ink-soft">
        <span>
          <span className="mr-1 inline-block size-3 border border-kerf bg-kerf-light align-middle" />
          parts
        </span>
        <span>
          <span className="mr-1 inline-block size-3 border border-dashed border-moss bg-moss-light align-middle" />
          offcuts kept
        </span>
        <span>
          <span className="mr-1 inline-block size-3 bg-ember/40 align-middle" />
          defect zones
        </span>
        <span>
          <span className="mr-1 inline-block h-0.5 w-4 bg-wire align-middle" />
          {props.cuts.length <= NUMBERED_CUTS
            ? "through cuts, numbered in order"
            : `through cuts (${props.cuts.length}: too many to number here; numbered in the list below and on the cutting steps)`}
        </span>
      </p>
      {props.facts !== false && <PlanFacts props={props} regions={regions} />}
    </div>
  );
}

const AXIS_WORDS = { x: "across the length", y: "across the width", z: "across the height" } as const;
/** The drawings' facts as text: each through cut in order with the piece it splits, and each part. */
function PlanFacts({ props, regions }: { props: PlanViewProps; regions: RegionCut[] }) {
  const unit = props.unit ?? "mm";
  const len = (v: number) => formatLength(v, unit);
  const at = (v: number) => lengthNumber(v, unit);
  const box = (min: readonly number[], max: readonly number[]) =>
    formatSize(
      [0, 1, 2].map((i) => max[i]! - min[i]!),
      unit,
    );
  const cuts = regions.slice(0, LIST_ROWS);
  const parts = props.placements.slice(0, LIST_ROWS);
  return (
    <details className="rounded-md border border-bead p-3" data-testid={`plan-facts-${props.block.id}`}>
      <summary className="cursor-pointer py-3 text-sm font-medium">
        In words: {regions.length} {regions.length === 1 ? "cut" : "cuts"} and {props.placements.length}{" "}
        {props.placements.length === 1 ? "part" : "parts"} of {props.block.id}
      </summary>
      <div className="mt-2 grid gap-4 lg:grid-cols-2">
        <div>
          <h4 className="text-sm font-semibold">Through cuts, in order</h4>
          <ol className="mt-1 space-y-1 text-sm">
            {cuts.map((c) => (
              <li key={c.n}>
                <span className="font-semibold tabular-nums">{c.n}.</span> {AXIS_WORDS[c.axis]}, wire at{" "}
                {len(c.at + props.kerf / 2)} from the {c.axis === "x" ? "left end" : c.axis === "y" ? "front" : "base"},
                through the piece {box(c.region.min, c.region.max)}
              </li>
            ))}
            {!regions.length && <li>No through cuts: the block is used whole.</li>}
          </ol>
          {regions.length > cuts.length && (
            <p className="mt-1 text-sm text-ink-soft">
              First {cuts.length} of {regions.length}; the cut sheet lists every one.
            </p>
          )}
        </div>
        <div>
          <h4 className="text-sm font-semibold">Parts, with their corner nearest the origin</h4>
          <ul className="mt-1 space-y-1 text-sm">
            {parts.map((p, i) => (
              <li key={`${p.part}-${i}`}>
                {props.partName(p.part)}: {formatSize(p.size, unit)} at x {at(p.origin[0])}, y {at(p.origin[1])}, z{" "}
                {at(p.origin[2])}
              </li>
            ))}
          </ul>
          {props.placements.length > parts.length && (
            <p className="mt-1 text-sm text-ink-soft">
              First {parts.length} of {props.placements.length}; the cut sheet lists every one.
            </p>
          )}
          {props.offcuts.length > 0 && (
            <p className="mt-2 text-sm">
              Offcuts kept: {props.offcuts.map((o) => formatSize(o.size, unit)).join("; ")}
            </p>
          )}
          {props.block.defects.length > 0 && (
            <p className="mt-2 text-sm">Defect zones: {props.block.defects.map((d) => box(d.min, d.max)).join("; ")}</p>
          )}
        </div>
      </div>
    </details>
  );
}
