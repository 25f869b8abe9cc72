"use client";

import { outline, parseNaca, checkPolygon, type Point, type Profile } from "@/lib/profiles";

/**
 * A small drawing of a part's profile in the cutting plane: a polygon, a NACA section (root
 * solid, tip dashed when the panel tapers, both from the leading edge as the wire sees them), or
 * for a plain box its face across the wire.
 */
export function SectionPreview({
  profile,
  size,
  width = 240,
  height = 120,
  label,
}: {
  profile: Profile | null;
  size?: [number, number, number];
  width?: number;
  height?: number;
  label?: string;
}) {
  const shapes: { pts: Point[]; dashed?: boolean }[] = [];
  try {
    // A plain box: its face in the cutting plane (width × height).
    if (!profile && size)
      shapes.push({
        pts: [
          [0, 0],
          [size[1], 0],
          [size[1], size[2]],
          [0, size[2]],
        ],
      });
    if (profile?.kind === "naca") {
      const s = parseNaca(profile.code);
      const root = profile.chordMm > 0 ? profile.chordMm : 1;
      shapes.push({ pts: outline(s, root, 60) });
      const tip = profile.tipChordMm ?? root;
      if (tip > 0 && (tip !== root || (profile.sweepMm ?? 0) !== 0)) {
        const dx = profile.sweepMm ?? 0;
        shapes.push({ pts: outline(s, tip, 60).map(([x, y]) => [x + dx, y] as Point), dashed: true });
      }
    } else if (profile?.kind === "polygon" && profile.points.length >= 2) {
      shapes.push({ pts: profile.points });
    }
  } catch {
    /* an unfinished code draws nothing */
  }
  const all = shapes.flatMap((s) => s.pts).filter(([x, y]) => Number.isFinite(x) && Number.isFinite(y));
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
  const k = Math.min((width - 2 * pad) / w, (height - 2 * pad) / h);
  const ox = (width - w * k) / 2,
    oy = (height - h * k) / 2;
  // SVG y runs down: flip so "up" in the cutting plane is up on screen.
  const path = (pts: Point[]) =>
    `${pts
      .map(
        ([x, y], i) =>
          `${i ? "L" : "M"}${(ox + (x - minX) * k).toFixed(1)},${(height - oy - (y - minY) * k).toFixed(1)}`,
      )
      .join(" ")} Z`;
  const bad = profile?.kind === "polygon" && checkPolygon(profile.points) !== null;
  return (
    <svg
      width={width}
      height={height}
      viewBox={`0 0 ${width} ${height}`}
      role="img"
      aria-label={label ?? "Profile preview"}
      data-testid="section-preview"
      className="rounded-md border border-bead bg-paper"
    >
      {profile?.kind === "naca" && (
        <line
          x1={pad / 2}
          x2={width - pad / 2}
          y1={height - oy - (0 - minY) * k}
          y2={height - oy - (0 - minY) * k}
          className="stroke-bead-strong"
          strokeDasharray="2 3"
        />
      )}
      {shapes.map((s, i) => (
        <path
          key={i}
          d={path(s.pts)}
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
    </svg>
  );
}
