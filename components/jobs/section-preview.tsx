"use client";

import { useEffect, useRef, useState } from "react";
import { outline, parseNaca, checkOutline, type Point, type Profile } from "@/lib/profiles";
import { formatLength, mmToIn, type LengthUnit } from "@/lib/units";
import type { Vec3 } from "@/lib/nesting";

/**
 * A length for a scale bar: the largest 1, 2 or 5 × 10ⁿ in the person's unit not over `maxMm`,
 * returned in mm.
 *
 *   niceLength(37, "mm")  // 20
 *   niceLength(100, "in") // 50.8 (2 in)
 */
export function niceLength(maxMm: number, unit: LengthUnit): number {
  const inUnit = unit === "in" ? mmToIn(maxMm) : maxMm;
  if (!(inUnit > 0)) return 0;
  const p = 10 ** Math.floor(Math.log10(inUnit));
  const step = [5, 2, 1].map((m) => m * p).find((v) => v <= inUnit) ?? p;
  return unit === "in" ? step * 25.4 : step;
}

/** SVG path data for an outer loop and its holes (drawn with fill-rule evenodd). */
function loopsPath(loops: Point[][], x: (v: number) => number, y: (v: number) => number): string {
  return loops
    .filter((l) => l.length >= 2)
    .map((l) => `${l.map(([px, py], i) => `${i ? "L" : "M"}${x(px).toFixed(2)},${y(py).toFixed(2)}`).join(" ")} Z`)
    .join(" ");
}

/** A dimension line with end ticks and its length written beside it. */
function Dimension({
  x1,
  y1,
  x2,
  y2,
  text,
  vertical,
  testId,
}: {
  x1: number;
  y1: number;
  x2: number;
  y2: number;
  text: string;
  vertical?: boolean;
  testId?: string;
}) {
  const t = 4;
  const mx = (x1 + x2) / 2,
    my = (y1 + y2) / 2;
  return (
    <g className="stroke-ink-faint" data-testid={testId}>
      <line x1={x1} y1={y1} x2={x2} y2={y2} strokeWidth={1} />
      {vertical ? (
        <>
          <line x1={x1 - t} x2={x1 + t} y1={y1} y2={y1} strokeWidth={1} />
          <line x1={x2 - t} x2={x2 + t} y1={y2} y2={y2} strokeWidth={1} />
          <text
            x={mx + 16}
            y={my}
            transform={`rotate(-90 ${mx + 16} ${my})`}
            textAnchor="middle"
            className="fill-ink-soft stroke-none"
            fontSize={12}
          >
            {text}
          </text>
        </>
      ) : (
        <>
          <line x1={x1} x2={x1} y1={y1 - t} y2={y1 + t} strokeWidth={1} />
          <line x1={x2} x2={x2} y1={y2 - t} y2={y2 + t} strokeWidth={1} />
          <text x={mx} y={my + 15} textAnchor="middle" className="fill-ink-soft stroke-none" fontSize={12}>
            {text}
          </text>
        </>
      )}
    </g>
  );
}

/** A bar of a round length, labelled, so the drawing can be read to scale. */
function ScaleBar({
  x,
  y,
  pxPerMm,
  maxPx,
  unit,
}: {
  x: number;
  y: number;
  pxPerMm: number;
  maxPx: number;
  unit: LengthUnit;
}) {
  const mm = niceLength(maxPx / pxPerMm, unit);
  if (!(mm > 0)) return null;
  const w = mm * pxPerMm;
  return (
    <g data-testid="scale-bar" data-length-mm={mm}>
      <rect x={x} y={y} width={w / 2} height={4} className="fill-ink-soft" />
      <rect
        x={x + w / 2}
        y={y}
        width={w / 2}
        height={4}
        className="fill-paper-raised stroke-ink-soft"
        strokeWidth={1}
      />
      <line x1={x} x2={x + w} y1={y + 2} y2={y + 2} data-role="bar" strokeWidth={0} />
      <text x={x + w + 6} y={y + 6} className="fill-ink-soft" fontSize={12}>
        {formatLength(mm, unit)}
      </text>
    </g>
  );
}

/**
 * A small drawing of a part's profile in the cutting plane: a polygon with its holes (even-odd
 * fill), a NACA section (root solid, tip dashed when the panel tapers, both from the leading edge as
 * the wire sees them), or for a plain box its face across the wire. With `dims`, drawn with its
 * overall width and height and a scale bar, in the person's unit.
 */
export function SectionPreview({
  profile,
  size,
  width = 240,
  height = 120,
  label,
  dims = false,
  unit = "mm",
}: {
  profile: Profile | null;
  size?: Vec3;
  width?: number;
  height?: number;
  label?: string;
  /** Overall dimensions and a scale bar. */
  dims?: boolean;
  unit?: LengthUnit;
}) {
  const shapes: { loops: Point[][]; dashed?: boolean }[] = [];
  try {
    // A plain box: its face in the cutting plane (width × height).
    if (!profile && size)
      shapes.push({
        loops: [
          [
            [0, 0],
            [size[1], 0],
            [size[1], size[2]],
            [0, size[2]],
          ],
        ],
      });
    if (profile?.kind === "naca") {
      const s = parseNaca(profile.code);
      const root = profile.chordMm > 0 ? profile.chordMm : 1;
      shapes.push({ loops: [outline(s, root, 60)] });
      const tip = profile.tipChordMm ?? root;
      if (tip > 0 && (tip !== root || (profile.sweepMm ?? 0) !== 0)) {
        const dx = profile.sweepMm ?? 0;
        shapes.push({ loops: [outline(s, tip, 60).map(([x, y]) => [x + dx, y] as Point)], dashed: true });
      }
    } else if (profile?.kind === "polygon" && profile.points.length >= 2) {
      shapes.push({ loops: [profile.points, ...(profile.holes ?? [])] });
    }
  } catch {
    /* an unfinished code draws nothing */
  }
  const all = shapes.flatMap((s) => s.loops[0] ?? []).filter(([x, y]) => Number.isFinite(x) && Number.isFinite(y));
  if (!all.length) {
    return (
      <div
        style={{ width, height }}
        className="flex items-center justify-center rounded-md border border-dashed border-bead-strong text-xs text-ink-faint"
      >
        No profile to draw
      </div>
    );
  }
  const xs = all.map((p) => p[0]);
  const ys = all.map((p) => p[1]);
  const minX = Math.min(...xs),
    maxX = Math.max(...xs),
    minY = Math.min(...ys),
    maxY = Math.max(...ys);
  const w = Math.max(maxX - minX, 1e-6),
    h = Math.max(maxY - minY, 1e-6);
  const pad = 8;
  // Room for the dimensions: the height on the right, the width and the scale bar below.
  const right = dims ? 40 : 0,
    below = dims ? 50 : 0;
  const k = Math.min((width - 2 * pad - right) / w, (height - 2 * pad - below) / h);
  const ox = (width - right - w * k) / 2,
    oy = pad + (height - 2 * pad - below - h * k) / 2;
  // SVG y runs down: flip so "up" in the cutting plane is up on screen.
  const X = (x: number) => ox + (x - minX) * k;
  const Y = (y: number) => oy + (maxY - y) * k;
  const bad =
    profile?.kind === "polygon" &&
    (() => {
      try {
        return checkOutline(profile.points, profile.holes ?? []) !== null;
      } catch {
        return true;
      }
    })();
  return (
    <svg
      width={width}
      height={height}
      viewBox={`0 0 ${width} ${height}`}
      role="img"
      aria-label={label ?? "Profile preview"}
      data-testid="section-preview"
      data-px-per-mm={k}
      data-width-mm={Math.round(w * 1000) / 1000}
      data-height-mm={Math.round(h * 1000) / 1000}
      className="max-w-full rounded-md border border-bead bg-paper"
    >
      {profile?.kind === "naca" && (
        <line
          x1={pad / 2}
          x2={width - pad / 2}
          y1={Y(0)}
          y2={Y(0)}
          className="stroke-bead-strong"
          strokeDasharray="2 3"
        />
      )}
      {shapes.map((s, i) => (
        <path
          key={i}
          d={loopsPath(s.loops, X, Y)}
          fillRule="evenodd"
          className={
            s.dashed
              ? "fill-none stroke-wire"
              : bad
                ? "fill-ember-light stroke-ember"
                : profile
                  ? "fill-kerf-light stroke-kerf"
                  : "fill-paper-sunk stroke-ink-faint"
          }
          strokeWidth={1.5}
          strokeDasharray={s.dashed ? "5 3" : undefined}
        />
      ))}
      {dims && (
        <>
          <Dimension
            x1={X(minX)}
            x2={X(maxX)}
            y1={Y(minY) + 10}
            y2={Y(minY) + 10}
            text={formatLength(w, unit)}
            testId="dim-width"
          />
          <Dimension
            x1={X(maxX) + 14}
            x2={X(maxX) + 14}
            y1={Y(maxY)}
            y2={Y(minY)}
            vertical
            text={formatLength(h, unit)}
            testId="dim-height"
          />
          <ScaleBar x={pad} y={height - 14} pxPerMm={k} maxPx={(width - 2 * pad) / 3} unit={unit} />
        </>
      )}
    </svg>
  );
}

export interface SheetProfile {
  name: string;
  points: Point[];
  holes?: Point[][];
}

/**
 * Several profiles side by side at one scale, each named, with its overall width and height, and
 * one scale bar: what a drawing or a word will become, before it is saved. Laid out for the width
 * of its column (at most `maxWidth` px) so its words stay readable; `data-px-per-mm` gives its scale.
 */
export function ProfileSheet({
  profiles,
  unit = "mm",
  maxWidth = 720,
  maxHeight = 220,
  label = "Profiles to scale",
}: {
  profiles: SheetProfile[];
  unit?: LengthUnit;
  maxWidth?: number;
  maxHeight?: number;
  label?: string;
}) {
  const box = useRef<HTMLDivElement>(null);
  const [width, setWidth] = useState(Math.min(640, maxWidth));
  useEffect(() => {
    const el = box.current;
    if (!el || typeof ResizeObserver === "undefined") return;
    const measure = () => setWidth(Math.max(280, Math.min(maxWidth, Math.floor(el.clientWidth))));
    measure();
    const watch = new ResizeObserver(measure);
    watch.observe(el);
    return () => watch.disconnect();
  }, [maxWidth]);
  if (!profiles.length) return null;
  const boxes = profiles.map((p) => {
    const xs = p.points.map((q) => q[0]),
      ys = p.points.map((q) => q[1]);
    const minX = Math.min(...xs),
      minY = Math.min(...ys);
    return { minX, minY, w: Math.max(Math.max(...xs) - minX, 1e-6), h: Math.max(Math.max(...ys) - minY, 1e-6) };
  });
  const pad = 10,
    gap = 40, // between profiles: room for each one's height dimension
    nameH = 22,
    dimH = 26,
    barH = 30;
  const sumW = boxes.reduce((s, b) => s + b.w, 0);
  const maxH = Math.max(...boxes.map((b) => b.h));
  const k = Math.min((width - 2 * pad - gap * profiles.length) / sumW, maxHeight / maxH);
  const drawH = maxH * k;
  const height = pad + drawH + dimH + nameH + barH;
  let x = pad;
  const cells = boxes.map((b, i) => {
    const cell = { x, b, p: profiles[i]! };
    x += b.w * k + gap;
    return cell;
  });
  return (
    <div ref={box}>
      <svg
        viewBox={`0 0 ${width} ${height}`}
        width="100%"
        style={{ maxWidth: width }}
        role="img"
        aria-label={`${label}: ${profiles.map((p, i) => `${p.name} ${formatLength(boxes[i]!.w, unit)} × ${formatLength(boxes[i]!.h, unit)}`).join("; ")}`}
        data-testid="profile-sheet"
        data-px-per-mm={k}
        className="block rounded-md border border-bead bg-paper"
      >
        {cells.map(({ x: cx, b, p }, i) => {
          const X = (v: number) => cx + (v - b.minX) * k;
          // Bottoms on one line, so heights compare at a glance.
          const Y = (v: number) => pad + drawH - (v - b.minY) * k;
          const bottom = pad + drawH;
          return (
            <g
              key={i}
              data-testid="sheet-profile"
              data-name={p.name}
              data-width-mm={Math.round(b.w * 1000) / 1000}
              data-height-mm={Math.round(b.h * 1000) / 1000}
            >
              <path
                d={loopsPath([p.points, ...(p.holes ?? [])], X, Y)}
                fillRule="evenodd"
                className="fill-kerf-light stroke-kerf"
                strokeWidth={1.25}
                data-role="outline"
              />
              <Dimension
                x1={X(b.minX)}
                x2={X(b.minX + b.w)}
                y1={bottom + 8}
                y2={bottom + 8}
                text={formatLength(b.w, unit)}
              />
              <Dimension
                x1={X(b.minX + b.w) + 12}
                x2={X(b.minX + b.w) + 12}
                y1={bottom - b.h * k}
                y2={bottom}
                vertical
                text={formatLength(b.h, unit)}
              />
              <text x={X(b.minX)} y={bottom + dimH + 14} className="fill-ink" fontSize={13} fontWeight={600}>
                {p.name}
              </text>
            </g>
          );
        })}
        <ScaleBar x={pad} y={height - 16} pxPerMm={k} maxPx={(width - 2 * pad) / 4} unit={unit} />
      </svg>
    </div>
  );
}
