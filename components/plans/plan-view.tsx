/**
 * A block of a plan, drawn to scale: top (length × width), front (length × height) and side
 * (width × height) views, then one top view per layer. Parts are labelled, defect zones shaded,
 * offcuts outlined, and the through cuts numbered in the order they are made.
 * Pure markup: renders on the server and in the browser alike.
 */
import { cutRegions, type RegionCut } from "@/lib/planning/cut-regions";

type V3 = [number, number, number];

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
}

const AX = { x: 0, y: 1, z: 2 } as const;
const PALETTE = ["#d7ecee", "#e0efe3", "#f6ecd2", "#efe0f3", "#e3e7f6", "#fbe6da"];

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
  const pad = 22;
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
  const labelled = props.cuts.length <= 30;
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
        style={{ maxWidth: w + pad * 2 }}
        role="img"
        aria-label={`${title} of ${block.id}`}
      >
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
              {pw > 34 && ph > 11 && (
                <text
                  x={px1(px + pw / 2)}
                  y={px1(py + ph / 2)}
                  fontSize={px1(Math.min(10, ph * 0.6))}
                  textAnchor="middle"
                  dominantBaseline="middle"
                  fill="#16525a"
                >
                  {label.length > pw / 6 ? `${label.slice(0, Math.max(2, Math.floor(pw / 6)))}…` : label}
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
              <line x1={X(pos)} x2={X(pos)} y1={Y(span[0]!)} y2={Y(span[1]!)} stroke="#d2571f" strokeWidth={1.1} />
              {labelled && (
                <text x={X(pos)} y={Y(span[1]!) - 3} fontSize={8} textAnchor="middle" fill="#d2571f" fontWeight={600}>
                  {c.n}
                </text>
              )}
            </g>
          ) : (
            <g key={`c${c.n}`}>
              <line x1={X(span[0]!)} x2={X(span[1]!)} y1={Y(pos)} y2={Y(pos)} stroke="#d2571f" strokeWidth={1.1} />
              {labelled && (
                <text
                  x={X(span[1]!) + 3}
                  y={Y(pos)}
                  fontSize={8}
                  dominantBaseline="middle"
                  fill="#d2571f"
                  fontWeight={600}
                >
                  {c.n}
                </text>
              )}
            </g>
          );
        })}
        <text x={X(W / 2)} y={Y(0) + 15} fontSize={10} textAnchor="middle" fill="#3d4f54">
          {Math.round(W)} mm
        </text>
        <text
          x={X(0) - 8}
          y={Y(H / 2)}
          fontSize={10}
          textAnchor="middle"
          fill="#3d4f54"
          transform={`rotate(-90 ${X(0) - 8} ${Y(H / 2)})`}
        >
          {Math.round(H)} mm
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
      <div className="grid gap-4 sm:grid-cols-2">
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
              className={long ? "sm:col-span-2" : ""}
            />
          );
        })}
      </div>
      {props.showLayers !== false && sorted.length > 1 && (
        <details className="rounded-md border border-bead p-3">
          <summary className="cursor-pointer py-3 text-sm font-medium">
            Layers ({sorted.length}), from the bottom
          </summary>
          <div className="mt-3 grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
            {sorted.map(([key, ps], i) => {
              const [lo, hi] = key.split("|").map(Number);
              return (
                <View
                  key={key}
                  title={`Layer ${i + 1}: z ${Math.round(lo!)}–${Math.round(hi!)} mm`}
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
          through cuts, numbered in order
        </span>
      </p>
    </div>
  );
}
