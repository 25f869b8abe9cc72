"use client";

import { useId, useRef, useState, type PointerEvent as ReactPointerEvent } from "react";
import { DEFECT_LABELS, type DefectKind } from "@/lib/stock";
import { formatLength, type LengthUnit } from "@/lib/units";
import type { Vec3 } from "@/lib/nesting";

export type ViewName = "top" | "front" | "side";
type Axis = 0 | 1 | 2;

export interface FaceDefect {
  id: number;
  kind: string;
  min: Vec3;
  max: Vec3;
}

/** What a drag on one view gives: that view's two axes (indices into x, y, z) and their range in mm. */
export interface DrawnRect {
  view: ViewName;
  axes: [Axis, Axis];
  min: [number, number];
  max: [number, number];
}

interface FaceViewsProps {
  /** The block's [x length, y width, z height] in mm. */
  size: Vec3;
  defects: FaceDefect[];
  unit: LengthUnit;
  /** Drawing mode: a drag on a view reports the rectangle in that view's two axes. */
  onDraw?: (rect: DrawnRect) => void;
  /** A zone to bring forward (the others fade). */
  highlight?: number | null;
  /** A zone being entered, drawn in hot-wire orange on every view. */
  draft?: { min: Vec3; max: Vec3 } | null;
}

// Third-angle layout: top above front, the right end beside the front. Each view is seen so that
// its first axis runs left to right and its second runs bottom to top, origin at the lower left.
const VIEWS: { name: ViewName; title: string; axes: [Axis, Axis]; caption: string }[] = [
  { name: "top", title: "Top", axes: [0, 1], caption: "from above · length × width" },
  { name: "front", title: "Front", axes: [0, 2], caption: "from the front · length × height" },
  { name: "side", title: "Right end", axes: [1, 2], caption: "from the right · width × height" },
];
const AXIS = ["x", "y", "z"] as const;

// Calm, distinguishable colours from the palette (tailwind.config.ts) for each kind of defect.
const KIND_COLOUR: Record<string, string> = {
  void: "#a8322a", // ember
  poor_fusion: "#a8740f", // ochre
  crush: "#d2571f", // wire
  wet_core: "#1f6c75", // kerf
  inclusion: "#3d4f54", // ink soft
  off_density: "#3b7a4a", // moss
  other: "#6b7b7f", // ink faint
};
const colourOf = (kind: string) => KIND_COLOUR[kind] ?? KIND_COLOUR.other!;
const labelOf = (kind: string) => DEFECT_LABELS[kind as DefectKind] ?? kind;

const INK = "#1c2a2e";
const INK_SOFT = "#3d4f54";
const INK_FAINT = "#6b7b7f";
const BEAD = "#ddd6c6";
const BEAD_STRONG = "#c4baa4";
const FOAM = "#f6f3ec";
const WIRE = "#d2571f";

// Room around each drawing for dimension lines and their figures (SVG units ≈ CSS px at 1:1).
const M = { left: 40, right: 14, top: 16, bottom: 38 };
const FONT = 13;
/** A coordinate to 0.01 SVG unit (a hundredth of a pixel at most): the markup stays short. */
const r2 = (n: number) => Math.round(n * 100) / 100;

interface Geometry {
  U: number; // the block along the view's horizontal axis, mm
  V: number; // … and along its vertical axis
  s: number; // SVG units per mm
  w: number;
  h: number;
}

function geometry(size: Vec3, axes: [Axis, Axis], s: number): Geometry {
  const U = size[axes[0]];
  const V = size[axes[1]];
  // Slivers stay visible even when a true-scale drawing would be a hairline.
  return { U, V, s, w: r2(Math.max(U * s, 8)), h: r2(Math.max(V * s, 8)) };
}

/** A round grid step (mm) giving four to ten lines along the block's longest side in this unit. */
function gridStep(longest: number, unit: LengthUnit): number {
  const steps =
    unit === "in"
      ? [1, 2, 3, 6, 12, 24, 48, 96].map((i) => i * 25.4)
      : [10, 20, 25, 50, 100, 200, 250, 500, 1000, 2000];
  return steps.find((st) => longest / st <= 10) ?? steps[steps.length - 1]!;
}

/**
 * The block's three faces to scale, with its defect zones projected onto each and its sizes
 * dimensioned in the person's unit. With `onDraw`, a drag on a face marks a zone (mouse, pen or
 * touch): the form gets that face's two axes and keeps the third (the depth) for typing.
 *
 *   <FaceViews size={[2440, 1220, 610]} unit="mm" defects={[{ id: 7, kind: "void", min: [400, 300, 100], max: [460, 380, 150] }]} />
 */
export function FaceViews({ size, defects, unit, onDraw, highlight = null, draft = null }: FaceViewsProps) {
  const uid = useId().replace(/[^a-zA-Z0-9_-]/g, "");
  // One scale for all three faces, so they read as one block; only an end view that would be too
  // small to see or draw on (a long block) is drawn larger, and says so.
  const sTop = Math.min(520 / size[0], 190 / size[1]);
  const sFront = Math.min(520 / size[0], 190 / size[2]);
  const sLong = Math.min(sTop, sFront);
  const sSideFit = Math.min(260 / size[1], 190 / size[2]);
  const sSide = Math.min(sSideFit, Math.max(sLong, 150 / Math.max(size[1], size[2])));
  const kinds = [...new Set(defects.map((d) => d.kind))];
  const step = gridStep(Math.max(...size), unit);

  return (
    <div className="@container" data-testid="face-views">
      <div className="grid gap-x-6 gap-y-4 @4xl:grid-cols-[minmax(0,1.9fr)_minmax(0,1fr)]">
        {VIEWS.map((v) => (
          <View
            key={v.name}
            uid={uid}
            view={v}
            size={size}
            g={geometry(size, v.axes, v.name === "side" ? sSide : sLong)}
            enlarged={v.name === "side" && sSide > sLong * 1.05}
            defects={defects}
            unit={unit}
            step={step}
            onDraw={onDraw}
            highlight={highlight}
            draft={draft}
          />
        ))}
        <Legend kinds={kinds} count={defects.length} size={size} unit={unit} drawing={!!onDraw} />
      </div>
    </div>
  );
}

interface ViewProps {
  uid: string;
  view: (typeof VIEWS)[number];
  size: Vec3;
  g: Geometry;
  defects: FaceDefect[];
  unit: LengthUnit;
  step: number;
  onDraw?: (rect: DrawnRect) => void;
  highlight: number | null;
  draft: { min: Vec3; max: Vec3 } | null;
  enlarged?: boolean;
}

function View({ uid, view, g, defects, unit, step, onDraw, highlight, draft, enlarged = false }: ViewProps) {
  const svgRef = useRef<SVGSVGElement>(null);
  const [drag, setDrag] = useState<{ u0: number; v0: number; u1: number; v1: number; id: number } | null>(null);
  const [a, b] = view.axes;
  const vbW = M.left + g.w + M.right;
  const vbH = M.top + g.h + M.bottom;
  // Block coordinates (mm) → SVG units. v grows upwards on paper, downwards in SVG.
  const X = (u: number) => r2(M.left + (u / g.U) * g.w);
  const Y = (v: number) => r2(M.top + g.h - (v / g.V) * g.h);

  const toBlock = (e: ReactPointerEvent): { u: number; v: number } | null => {
    const svg = svgRef.current;
    const ctm = svg?.getScreenCTM();
    if (!svg || !ctm) return null;
    const p = new DOMPoint(e.clientX, e.clientY).matrixTransform(ctm.inverse());
    const u = ((p.x - M.left) / g.w) * g.U;
    const v = ((M.top + g.h - p.y) / g.h) * g.V;
    return { u: Math.min(Math.max(u, 0), g.U), v: Math.min(Math.max(v, 0), g.V) };
  };

  const drawing = !!onDraw;
  const handlers = drawing
    ? {
        onPointerDown(e: ReactPointerEvent<SVGSVGElement>) {
          if (e.button !== 0) return;
          const p = toBlock(e);
          if (!p) return;
          e.preventDefault();
          e.currentTarget.setPointerCapture(e.pointerId);
          setDrag({ u0: p.u, v0: p.v, u1: p.u, v1: p.v, id: e.pointerId });
        },
        onPointerMove(e: ReactPointerEvent<SVGSVGElement>) {
          if (!drag || drag.id !== e.pointerId) return;
          const p = toBlock(e);
          if (p) setDrag({ ...drag, u1: p.u, v1: p.v });
        },
        onPointerUp(e: ReactPointerEvent<SVGSVGElement>) {
          if (!drag || drag.id !== e.pointerId) return;
          const p = toBlock(e) ?? { u: drag.u1, v: drag.v1 };
          setDrag(null);
          const lo = [Math.floor(Math.min(drag.u0, p.u)), Math.floor(Math.min(drag.v0, p.v))] as [number, number];
          const hi = [Math.ceil(Math.max(drag.u0, p.u)), Math.ceil(Math.max(drag.v0, p.v))] as [number, number];
          // A tap is not a zone: ask for a drag of at least a few screen units each way.
          const minU = (4 / g.w) * g.U;
          const minV = (4 / g.h) * g.V;
          if (hi[0] - lo[0] < minU && hi[1] - lo[1] < minV) return;
          if (hi[0] <= lo[0]) hi[0] = Math.min(lo[0] + 1, g.U);
          if (hi[1] <= lo[1]) hi[1] = Math.min(lo[1] + 1, g.V);
          onDraw!({ view: view.name, axes: view.axes, min: lo, max: hi });
        },
        onPointerCancel() {
          setDrag(null);
        },
      }
    : {};

  const gridU: number[] = [];
  for (let u = step; u < g.U - step * 0.15; u += step) gridU.push(u);
  const gridV: number[] = [];
  for (let v = step; v < g.V - step * 0.15; v += step) gridV.push(v);

  const boxOf = (min: Vec3, max: Vec3) => {
    const x0 = X(min[a]),
      x1 = X(max[a]),
      y0 = Y(max[b]),
      y1 = Y(min[b]);
    // Tiny zones stay visible (at least 3 units across).
    const cx = (x0 + x1) / 2,
      cy = (y0 + y1) / 2;
    const w = Math.max(x1 - x0, 3),
      h = Math.max(y1 - y0, 3);
    return { x: r2(cx - w / 2), y: r2(cy - h / 2), w: r2(w), h: r2(h) };
  };

  const live = drag
    ? {
        x: X(Math.min(drag.u0, drag.u1)),
        y: Y(Math.max(drag.v0, drag.v1)),
        w: Math.abs(X(drag.u1) - X(drag.u0)),
        h: Math.abs(Y(drag.v1) - Y(drag.v0)),
      }
    : null;

  const title = `${view.title} view: ${AXIS[a]} ${formatLength(g.U, unit)} by ${AXIS[b]} ${formatLength(g.V, unit)}`;
  const hatch = (kind: string) => `hatch-${uid}-${kind}`;

  return (
    <figure
      className={
        view.name === "top"
          ? "@4xl:col-start-1 @4xl:row-start-1"
          : view.name === "front"
            ? "@4xl:col-start-1 @4xl:row-start-2"
            : "@4xl:col-start-2 @4xl:row-start-2"
      }
    >
      <figcaption className="mb-1 flex items-baseline gap-2 text-sm">
        <span className="font-semibold text-ink">{view.title}</span>
        <span className="text-xs text-ink-faint">
          {view.caption}
          {enlarged && " · drawn larger than the others"}
        </span>
      </figcaption>
      <svg
        ref={svgRef}
        viewBox={`0 0 ${vbW.toFixed(1)} ${vbH.toFixed(1)}`}
        width="100%"
        role="img"
        aria-label={title}
        data-view={view.name}
        className={`block h-auto select-none ${drawing ? "cursor-crosshair" : ""}`}
        style={{ maxWidth: `${Math.round(vbW * 1.45)}px`, touchAction: drawing ? "none" : undefined }}
        fontFamily="var(--font-inter), system-ui, sans-serif"
        {...handlers}
      >
        <defs>
          <pattern id={`beads-${uid}-${view.name}`} patternUnits="userSpaceOnUse" width="10" height="8.66">
            <circle cx="2.5" cy="2.2" r="2.3" fill="none" stroke={BEAD} strokeWidth="0.7" />
            <circle cx="7.5" cy="6.5" r="2.3" fill="none" stroke={BEAD} strokeWidth="0.7" />
          </pattern>
          {[...new Set(defects.map((d) => d.kind))].map((k) => (
            <pattern
              key={k}
              id={hatch(k)}
              patternUnits="userSpaceOnUse"
              width="6"
              height="6"
              patternTransform="rotate(45)"
            >
              <line x1="0" y1="0" x2="0" y2="6" stroke={colourOf(k)} strokeWidth="1.4" strokeOpacity="0.55" />
            </pattern>
          ))}
          <marker
            id={`arrow-${uid}`}
            viewBox="0 0 8 8"
            refX="7.5"
            refY="4"
            markerWidth="7"
            markerHeight="7"
            orient="auto-start-reverse"
          >
            <path d="M0,0.8 L8,4 L0,7.2 z" fill={INK_FAINT} />
          </marker>
        </defs>
        <title>{title}</title>

        {/* The foam body: bead texture, a quiet grid at round distances, the outline. */}
        <rect x={M.left} y={M.top} width={g.w} height={g.h} fill={FOAM} />
        <rect x={M.left} y={M.top} width={g.w} height={g.h} fill={`url(#beads-${uid}-${view.name})`} />
        {gridU.length + gridV.length > 0 && (
          // One path for the whole grid, not an element per line.
          <path
            fill="none"
            stroke={BEAD_STRONG}
            strokeWidth="0.6"
            strokeDasharray="2 3"
            d={[
              ...gridU.map((u) => `M${X(u)} ${M.top}V${r2(M.top + g.h)}`),
              ...gridV.map((v) => `M${M.left} ${Y(v)}H${r2(M.left + g.w)}`),
            ].join("")}
          />
        )}

        {defects.map((d) => {
          const r = boxOf(d.min, d.max);
          const c = colourOf(d.kind);
          const faded = highlight !== null && highlight !== d.id;
          const strong = highlight === d.id;
          return (
            <g key={d.id} opacity={faded ? 0.35 : 1} data-defect={d.id}>
              <title>{`${labelOf(d.kind)}: ${AXIS[a]} ${formatLength(d.min[a], unit)}–${formatLength(d.max[a], unit)}, ${AXIS[b]} ${formatLength(d.min[b], unit)}–${formatLength(d.max[b], unit)}`}</title>
              <rect x={r.x} y={r.y} width={r.w} height={r.h} fill={c} fillOpacity="0.14" />
              <rect
                x={r.x}
                y={r.y}
                width={r.w}
                height={r.h}
                fill={`url(#${hatch(d.kind)})`}
                stroke={c}
                strokeWidth={strong ? 2.2 : 1.3}
                rx="1.5"
              />
            </g>
          );
        })}

        {draft &&
          validBox(draft) &&
          (() => {
            const r = boxOf(draft.min, draft.max);
            return (
              <g data-draft="">
                <rect
                  x={r.x}
                  y={r.y}
                  width={r.w}
                  height={r.h}
                  fill={WIRE}
                  fillOpacity="0.16"
                  stroke={WIRE}
                  strokeWidth="1.8"
                  strokeDasharray="5 3"
                  rx="1.5"
                />
              </g>
            );
          })()}
        {live && (
          <rect
            x={live.x}
            y={live.y}
            width={live.w}
            height={live.h}
            fill={WIRE}
            fillOpacity="0.12"
            stroke={WIRE}
            strokeWidth="1.5"
            strokeDasharray="3 3"
          />
        )}

        <rect x={M.left} y={M.top} width={g.w} height={g.h} fill="none" stroke={INK_SOFT} strokeWidth="1.4" />
        {/* The origin corner, where x, y and z are measured from. */}
        <circle cx={M.left} cy={M.top + g.h} r="3.2" fill={INK} />

        {/* Labels last, with a paper halo, placed so they do not sit on each other. */}
        {placeLabels(
          [
            ...defects.map((d) => ({
              key: `l${d.id}`,
              box: boxOf(d.min, d.max),
              text: labelOf(d.kind),
              colour: colourOf(d.kind),
              weight: 600,
              faded: highlight !== null && highlight !== d.id,
            })),
            ...(draft && validBox(draft)
              ? [
                  {
                    key: "draft",
                    box: boxOf(draft.min, draft.max),
                    text: "New zone",
                    colour: WIRE,
                    weight: 700,
                    faded: false,
                  },
                ]
              : []),
          ],
          { left: M.left, top: M.top, right: M.left + g.w, bottom: M.top + g.h },
        ).map((l) => (
          <text
            key={l.key}
            x={r2(l.x)}
            y={r2(l.y)}
            fontSize={FONT - 1}
            fontWeight={l.weight}
            fill={l.colour}
            opacity={l.faded ? 0.35 : 1}
            stroke="#fff"
            strokeWidth="3"
            strokeLinejoin="round"
            paintOrder="stroke"
          >
            {l.text}
          </text>
        ))}

        <Dimension
          x1={M.left}
          y1={M.top + g.h}
          x2={M.left + g.w}
          y2={M.top + g.h}
          offset={14}
          label={`${AXIS[a]} ${formatLength(g.U, unit)}`}
          uid={uid}
        />
        <Dimension
          x1={M.left}
          y1={M.top + g.h}
          x2={M.left}
          y2={M.top}
          offset={-14}
          label={`${AXIS[b]} ${formatLength(g.V, unit)}`}
          uid={uid}
          vertical
        />
      </svg>
    </figure>
  );
}

interface LabelIn {
  key: string;
  box: { x: number; y: number; w: number; h: number };
  text: string;
  colour: string;
  weight: number;
  faded: boolean;
}

/**
 * Puts each zone's name just above or below its box (or right-aligned to it), taking the first
 * spot that stays inside the drawing and clear of the names already placed.
 */
function placeLabels(items: LabelIn[], area: { left: number; top: number; right: number; bottom: number }) {
  const placed: { x: number; y: number; w: number; h: number }[] = [];
  const lh = FONT;
  const overlaps = (r: { x: number; y: number; w: number; h: number }) =>
    placed.some((p) => r.x < p.x + p.w + 2 && p.x < r.x + r.w + 2 && r.y < p.y + p.h && p.y < r.y + r.h);
  return items.map((it) => {
    const tw = it.text.length * (FONT - 1) * 0.56;
    const clampX = (x: number) => Math.min(Math.max(x, area.left + 3), area.right - tw - 3);
    const b = it.box;
    const candidates = [
      { x: clampX(b.x), base: b.y - 5 },
      { x: clampX(b.x), base: b.y + b.h + lh + 1 },
      { x: clampX(b.x + b.w - tw), base: b.y - 5 },
      { x: clampX(b.x + b.w - tw), base: b.y + b.h + lh + 1 },
      { x: clampX(b.x + 3), base: b.y + lh + 2 },
    ].map((c) => ({ ...c, rect: { x: c.x, y: c.base - lh + 2, w: tw, h: lh } }));
    const inside = (c: (typeof candidates)[number]) =>
      c.rect.y >= area.top - 2 && c.rect.y + c.rect.h <= area.bottom - 1;
    const pick = candidates.find((c) => inside(c) && !overlaps(c.rect)) ?? candidates.find(inside) ?? candidates[0]!;
    placed.push(pick.rect);
    return { ...it, x: pick.x, y: pick.base };
  });
}

function validBox(d: { min: Vec3; max: Vec3 }) {
  return d.min.every((v, i) => Number.isFinite(v) && Number.isFinite(d.max[i]!) && d.max[i]! > v);
}

/** A dimension line with extension lines, arrowheads and its figure, outside the drawing. */
function Dimension({
  x1,
  y1,
  x2,
  y2,
  offset,
  label,
  uid,
  vertical = false,
}: {
  x1: number;
  y1: number;
  x2: number;
  y2: number;
  offset: number;
  label: string;
  uid: string;
  vertical?: boolean;
}) {
  if (!vertical) {
    const y = r2(y1 + offset);
    const mid = r2((x1 + x2) / 2);
    return (
      <g stroke={INK_FAINT} strokeWidth="0.8">
        <line x1={x1} y1={y1 + 3} x2={x1} y2={y + 4} />
        <line x1={x2} y1={y2 + 3} x2={x2} y2={y + 4} />
        <line
          x1={x1 + 1}
          y1={y}
          x2={x2 - 1}
          y2={y}
          markerStart={`url(#arrow-${uid})`}
          markerEnd={`url(#arrow-${uid})`}
        />
        <text
          x={mid}
          y={y + FONT + 3}
          textAnchor="middle"
          fontSize={FONT}
          fill={INK_SOFT}
          stroke="none"
          style={{ fontVariantNumeric: "tabular-nums" }}
        >
          {label}
        </text>
      </g>
    );
  }
  const x = r2(x1 + offset);
  const mid = r2((y1 + y2) / 2);
  return (
    <g stroke={INK_FAINT} strokeWidth="0.8">
      <line x1={x1 - 3} y1={y1} x2={x - 4} y2={y1} />
      <line x1={x2 - 3} y1={y2} x2={x - 4} y2={y2} />
      <line x1={x} y1={y1 - 1} x2={x} y2={y2 + 1} markerStart={`url(#arrow-${uid})`} markerEnd={`url(#arrow-${uid})`} />
      <text
        x={x - 6}
        y={mid}
        textAnchor="middle"
        fontSize={FONT}
        fill={INK_SOFT}
        stroke="none"
        transform={`rotate(-90 ${x - 6} ${mid})`}
        style={{ fontVariantNumeric: "tabular-nums" }}
      >
        {label}
      </text>
    </g>
  );
}

function Legend({
  kinds,
  count,
  size,
  unit,
  drawing,
}: {
  kinds: string[];
  count: number;
  size: Vec3;
  unit: LengthUnit;
  drawing: boolean;
}) {
  return (
    <div className="space-y-3 text-sm @4xl:col-start-2 @4xl:row-start-1 @4xl:self-end">
      <p className="text-ink-soft">
        <span className="font-medium text-ink">
          {formatLength(size[0], unit)} × {formatLength(size[1], unit)} × {formatLength(size[2], unit)}
        </span>
        <br />
        <span className="text-xs text-ink-faint">
          <span aria-hidden className="mr-1 inline-block h-2 w-2 rounded-full bg-ink align-middle" />
          origin: x along the length, y across the width, z up the height
        </span>
      </p>
      {count > 0 ? (
        <ul className="flex flex-wrap gap-x-4 gap-y-1.5" aria-label="Defect kinds shown">
          {kinds.map((k) => (
            <li key={k} className="flex items-center gap-1.5">
              <span
                aria-hidden
                className="inline-block h-3 w-3 rounded-sm border"
                style={{ borderColor: colourOf(k), background: `${colourOf(k)}33` }}
              />
              <span className="text-ink-soft">{labelOf(k)}</span>
            </li>
          ))}
        </ul>
      ) : (
        <p className="text-xs text-ink-faint">No defect zones recorded.</p>
      )}
      {drawing && (
        <p className="rounded-md bg-wire-light px-3 py-2 text-xs text-ink">
          Drag across a face to mark a zone. The face gives two sides of the box; type the depth.
        </p>
      )}
    </div>
  );
}
