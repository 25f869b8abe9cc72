"use client";

import type { ReactNode } from "react";
import { Field, Input } from "@/components/ui/field";
import type { NacaProfile } from "@/lib/profiles";
import { formatLength, type LengthUnit } from "@/lib/units";
import { SectionPreview } from "./section-preview";

interface Props {
  v: Record<string, string>;
  set: (k: string) => (e: { target: { value: string } }) => void;
  err: (...keys: string[]) => string | undefined;
  unit: LengthUnit;
  /** The panel as typed so far (lengths in mm), or null while the code is unfinished. */
  profile: NacaProfile | null;
  /** Box and foam line under the section. */
  computed: ReactNode;
}

const W = 360;
/** The tallest the plan's panel is drawn, px (a short, wide panel is drawn as flat as it is). */
const MAX_PANEL_H = 170;

/**
 * The wing panel in plan, to scale: root chord on the left edge, tip chord on the right, span
 * along the bottom, sweep where the tip's leading edge sits behind the root's. Leading edge up.
 * With nothing typed yet, a sketch with the names in place of the numbers.
 */
export function PanelPlan({ profile, unit }: { profile: NacaProfile | null; unit: LengthUnit }) {
  const real = profile && profile.chordMm > 0 && profile.spanMm > 0;
  const cr = real ? profile.chordMm : 200;
  const ct = real ? (profile.tipChordMm ?? profile.chordMm) || cr : 130;
  const span = real ? profile.spanMm : 420;
  const sweep = real ? (profile.sweepMm ?? 0) : 50;
  const left = 86,
    right = 92,
    top = 22,
    bottom = 46;
  const minY = Math.min(0, sweep),
    maxY = Math.max(cr, sweep + ct);
  const k = Math.min((W - left - right) / span, MAX_PANEL_H / (maxY - minY));
  // As tall as the panel drawn to scale needs, and room for the two lines of each chord's label.
  const H = top + Math.max((maxY - minY) * k, 36) + bottom;
  const X = (x: number) => left + x * k;
  const Y = (y: number) => top + (y - minY) * k;
  const n = (mm: number) => (real ? formatLength(mm, unit) : "");
  const label = real
    ? `Wing panel in plan: root chord ${n(cr)}, tip chord ${n(ct)}, span ${n(span)}, sweep ${n(sweep)}`
    : "Wing panel in plan: type the root chord, tip chord, span and sweep";
  return (
    <svg
      viewBox={`0 0 ${W} ${H}`}
      width="100%"
      style={{ maxWidth: W }}
      role="img"
      aria-label={label}
      data-testid="panel-plan"
      data-px-per-mm={real ? k : undefined}
      className="block rounded-md border border-bead bg-paper"
    >
      <polygon
        points={`${X(0)},${Y(0)} ${X(span)},${Y(sweep)} ${X(span)},${Y(sweep + ct)} ${X(0)},${Y(cr)}`}
        className={real ? "fill-kerf-light stroke-kerf" : "fill-paper-sunk stroke-bead-strong"}
        strokeWidth={1.25}
        strokeDasharray={real ? undefined : "4 3"}
      />
      {/* Root chord: the left edge, solid (as the root section below). */}
      <line x1={X(0)} x2={X(0)} y1={Y(0)} y2={Y(cr)} className="stroke-kerf-dark" strokeWidth={3} />
      <text
        x={X(0) - 8}
        y={(Y(0) + Y(cr)) / 2 - 4}
        textAnchor="end"
        className="fill-ink"
        fontSize={12}
        fontWeight={600}
      >
        root
      </text>
      <text
        x={X(0) - 8}
        y={(Y(0) + Y(cr)) / 2 + 12}
        textAnchor="end"
        className="fill-ink-soft"
        fontSize={12}
        data-testid="plan-root"
      >
        {n(cr) || "chord"}
      </text>
      {/* Tip chord: the right edge, dashed (as the tip section below). */}
      <line
        x1={X(span)}
        x2={X(span)}
        y1={Y(sweep)}
        y2={Y(sweep + ct)}
        className="stroke-wire"
        strokeWidth={3}
        strokeDasharray="6 3"
      />
      <text x={X(span) + 8} y={(Y(sweep) + Y(sweep + ct)) / 2 - 4} className="fill-ink" fontSize={12} fontWeight={600}>
        tip
      </text>
      <text
        x={X(span) + 8}
        y={(Y(sweep) + Y(sweep + ct)) / 2 + 12}
        className="fill-ink-soft"
        fontSize={12}
        data-testid="plan-tip"
      >
        {n(ct) || "chord"}
      </text>
      {/* Span along the bottom. */}
      <g className="stroke-ink-faint">
        <line x1={X(0)} x2={X(span)} y1={H - 26} y2={H - 26} strokeWidth={1} />
        <line x1={X(0)} x2={X(0)} y1={H - 30} y2={H - 22} strokeWidth={1} />
        <line x1={X(span)} x2={X(span)} y1={H - 30} y2={H - 22} strokeWidth={1} />
      </g>
      <text
        x={(X(0) + X(span)) / 2}
        y={H - 8}
        textAnchor="middle"
        className="fill-ink-soft"
        fontSize={12}
        data-testid="plan-span"
      >
        span {n(span) || "along the wire"}
      </text>
      {/* Sweep: how far the tip's leading edge sits behind the root's. */}
      {sweep !== 0 && (
        <>
          <line x1={X(0)} x2={X(span) + 6} y1={Y(0)} y2={Y(0)} className="stroke-ink-faint" strokeDasharray="2 3" />
          <line
            x1={X(span) + 4}
            x2={X(span) + 4}
            y1={Y(0)}
            y2={Y(sweep)}
            className="stroke-ink-faint"
            strokeWidth={1}
          />
        </>
      )}
      <text
        x={X(span) + 8}
        y={Math.min(Y(0), Y(sweep)) - 6}
        className="fill-ink-soft"
        fontSize={12}
        data-testid="plan-sweep"
      >
        sweep {real ? n(sweep) : ""}
      </text>
      <text x={X(0)} y={12} className="fill-ink-faint" fontSize={11}>
        leading edge ↑
      </text>
    </svg>
  );
}

/**
 * The wing panel's fields laid out around its drawing: root chord by the root edge, tip chord and
 * sweep by the tip, span under the plan; the NACA code beside the section, drawn to scale at the
 * root (tip dashed).
 */
export function WingPanelFields({ v, set, err, unit, profile, computed }: Props) {
  const num = (name: string, label: string, hint?: string) => (
    <Field label={label} name={name} error={err(`profile.${name}`)} hint={hint}>
      <Input
        name={name}
        inputMode="decimal"
        value={v[name] ?? ""}
        onChange={set(name)}
        error={err(`profile.${name}`)}
      />
    </Field>
  );
  return (
    <div className="@container space-y-4" data-testid="wing-panel">
      <fieldset className="space-y-2">
        <legend className="text-sm font-medium text-ink-soft">The panel in plan</legend>
        {/* Narrow: the drawing, then the fields in order. Wide: root by the root edge, tip by the tip, span under. */}
        <div className="grid items-center gap-3 @xl:grid-cols-[9.5rem_1fr_9.5rem]">
          <div className="flex justify-center @xl:col-start-2 @xl:row-start-1">
            <PanelPlan profile={profile} unit={unit} />
          </div>
          <div className="@xl:col-start-1 @xl:row-start-1">{num("chordMm", `Root chord ${unit}`)}</div>
          <div className="@xl:col-start-3 @xl:row-start-1">
            {num("tipChordMm", `Tip chord ${unit}`, "Empty: as the root (a 2-axis cut).")}
          </div>
          <div className="self-start @xl:col-start-2 @xl:row-start-2">
            {num("spanMm", `Span ${unit} (along the wire)`)}
          </div>
          <div className="self-start @xl:col-start-3 @xl:row-start-2">
            {num("sweepMm", `Sweep ${unit}`, "Tip leading edge behind the root's. Empty: straight.")}
          </div>
        </div>
      </fieldset>
      <fieldset className="space-y-2">
        <legend className="text-sm font-medium text-ink-soft">The section, to scale</legend>
        <div className="grid items-start gap-3 @xl:grid-cols-[9.5rem_1fr]">
          <Field label="NACA code" name="code" error={err("profile.code")} hint="Four digits, e.g. 2412 or 0012.">
            <Input name="code" value={v.code ?? ""} onChange={set("code")} error={err("profile.code")} />
          </Field>
          <div className="space-y-1">
            <SectionPreview
              profile={profile}
              width={360}
              height={140}
              dims
              unit={unit}
              label={`NACA ${v.code} section: root solid${profile && (profile.tipChordMm ?? profile.chordMm) !== profile.chordMm ? ", tip dashed" : ""}`}
            />
            {computed}
          </div>
        </div>
      </fieldset>
    </div>
  );
}
