"use client";

import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button } from "@/components/ui/button";

import { Choices, Field, Input, Select } from "@/components/ui/field";
import { ROTATE_LABELS, ROTATE_RULES } from "@/lib/job-terms";
import { partGeometry, parsePoints, type Profile } from "@/lib/profiles";
import { formatSize, lengthToMm, type LengthUnit } from "@/lib/units";
import { fieldError, lengthMmOrNull, numberOrNull as num } from "@/lib/forms";
import { SectionPreview } from "./section-preview";
import { ResultNotice } from "@/components/ui/result-notice";
import { ProfileImport, type ImportPreview } from "./profile-import";
import { WingPanelFields } from "./wing-panel-fields";

type Shape = "box" | "polygon" | "naca" | "drawing" | "text";
const SHAPES: [Shape, string][] = [
  ["box", "Box"],
  ["polygon", "Polygon profile"],
  ["naca", "NACA wing panel"],
  ["drawing", "From a drawing"],
  ["text", "Text"],
];

interface Props {
  /** Where the part goes: a job's part list, or the library. */
  target: { kind: "job"; jobId: number } | { kind: "library" };
  grades: { id: number; code: string }[];
  kits?: string[];
  /** Lengths are typed in this unit (the person's display unit) and sent in mm. */
  unit?: LengthUnit;
}

/**
 * Adds a part by hand: a plain box, a polygon extruded along the wire, a NACA wing panel (a tip
 * chord different from the root makes it a tapered 4-axis panel), the outlines of a DXF or SVG
 * drawing, or letters. The drawing and the computed box follow the fields as they are typed; the
 * server computes them again before saving. A drawing or a word adds one part per profile, all in
 * one request (all or none).
 */
export function PartForm({ target, grades, kits = [], unit = "mm" }: Props) {
  const len = (s: string | undefined) => lengthMmOrNull(s ?? "", unit);
  const router = useRouter();
  const [shape, setShape] = useState<Shape>("box");
  const [v, setV] = useState<Record<string, string>>({
    quantity: "1",
    rotate: "any",
    code: "2412",
    chordMm: "",
    tipChordMm: "",
    spanMm: "",
    sweepMm: "",
    points: "",
    extrudeMm: "",
  });
  const [fields, setFields] = useState<Record<string, string>>({});
  const [msg, setMsg] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const [preview, setPreview] = useState<ImportPreview | null>(null);
  const imported = shape === "drawing" || shape === "text";
  const set = (k: string) => (e: { target: { value: string } }) => setV((s) => ({ ...s, [k]: e.target.value }));

  // biome-ignore lint/correctness/useExhaustiveDependencies: recomputed from the form values it reads
  const profile = useMemo((): { profile: Profile | null; error: string | null } => {
    try {
      if (shape === "naca") {
        return {
          profile: {
            kind: "naca",
            code: v.code ?? "",
            chordMm: len(v.chordMm) ?? 0,
            tipChordMm: len(v.tipChordMm),
            spanMm: len(v.spanMm) ?? 0,
            sweepMm: len(v.sweepMm),
          },
          error: null,
        };
      }
      if (shape === "polygon")
        return {
          profile: {
            kind: "polygon",
            points: parsePoints(v.points ?? "").map(([x, y]): [number, number] => [
              lengthToMm(x, unit),
              lengthToMm(y, unit),
            ]),
            extrudeMm: len(v.extrudeMm) ?? 0,
          },
          error: null,
        };
    } catch (e) {
      return { profile: null, error: (e as Error).message };
    }
    return { profile: null, error: null };
  }, [shape, v, unit]);

  const computed = useMemo(() => {
    if (!profile.profile) return null;
    try {
      return { ...partGeometry(profile.profile), error: null };
    } catch (e) {
      return { error: (e as Error).message };
    }
  }, [profile]);

  /** Each imported profile's part name: its own, or the typed name (in front of it when there are several). */
  const importedName = (own: string, count: number) => {
    const typed = (v.name ?? "").trim();
    return (typed ? (count === 1 ? typed : `${typed} — ${own}`) : own).slice(0, 120);
  };

  async function submitImported() {
    const profiles = preview?.profiles ?? [];
    if (!profiles.length) {
      setMsg({
        tone: "danger",
        text:
          shape === "drawing"
            ? "Read a drawing first: choose a DXF or SVG file, or paste a path."
            : "Draw the letters first.",
      });
      return;
    }
    const extrudeMm = len(v.extrudeMm);
    const quantity = num(v.quantity ?? "");
    const parts = profiles.map((p) => ({
      name: importedName(p.name, profiles.length),
      gradeId: v.gradeId ? Number(v.gradeId) : null,
      rotate: v.rotate,
      profile: { kind: "polygon", points: p.points, holes: p.holes, source: p.source, extrudeMm },
      ...(target.kind === "job" ? { quantity } : { kit: v.kit ?? null, defaultQuantity: quantity ?? 1 }),
    }));
    await send(target.kind === "job" ? `/api/jobs/${target.jobId}/parts` : "/api/library", "POST", { parts });
    setMsg({
      tone: "success",
      text: `${parts.length === 1 ? parts[0]!.name : `${parts.length} parts (${parts.map((p) => p.name).join(", ")})`} added.`,
    });
    setPreview(null);
  }

  async function submit() {
    setFields({});
    setMsg(null);
    setBusy(true);
    if (imported) {
      try {
        await submitImported();
        router.refresh();
      } catch (err) {
        if (err instanceof ApiError) {
          // "parts.2.profile.extrudeMm" is shown where "profile.extrudeMm" would be.
          const f: Record<string, string> = {};
          for (const [k, m] of Object.entries(err.fields ?? {})) f[k.replace(/^parts\.\d+\./, "")] ??= m;
          setFields(f);
          setMsg({ tone: "danger", text: err.message });
        }
      } finally {
        setBusy(false);
      }
      return;
    }
    const base = {
      name: v.name ?? "",
      gradeId: v.gradeId ? Number(v.gradeId) : null,
      rotate: v.rotate,
      ...(shape === "box" ? { size: [len(v.length), len(v.width), len(v.height)] } : { profile: profile.profile }),
    };
    try {
      if (target.kind === "job") {
        await send(`/api/jobs/${target.jobId}/parts`, "POST", { ...base, quantity: num(v.quantity ?? "") });
      } else {
        await send("/api/library", "POST", {
          ...base,
          kit: v.kit ?? null,
          defaultQuantity: num(v.quantity ?? "") ?? 1,
        });
      }
      setMsg({ tone: "success", text: `${base.name} added.` });
      setV((s) => ({ ...s, name: "" }));
      router.refresh();
    } catch (err) {
      if (err instanceof ApiError) {
        setFields(err.fields ?? {});
        setMsg({ tone: "danger", text: err.message });
      }
    } finally {
      setBusy(false);
    }
  }

  const err = (...keys: string[]) => fieldError(fields, ...keys);
  const qtyField = target.kind === "job" ? "quantity" : "defaultQuantity";
  const extrudeField = (
    <Field
      label={`Extrusion ${unit} (along the wire)`}
      name="extrudeMm"
      error={err("profile.extrudeMm")}
      hint={imported ? "The thickness of each part: how far the wire runs through it." : undefined}
    >
      <Input
        name="extrudeMm"
        inputMode="decimal"
        value={v.extrudeMm ?? ""}
        onChange={set("extrudeMm")}
        error={err("profile.extrudeMm")}
      />
    </Field>
  );
  const computedBox = (
    <div className="text-xs text-ink-soft" data-testid="computed-box">
      {profile.error ? (
        <span className="text-ember">{profile.error}</span>
      ) : computed && "size" in computed && computed.size ? (
        <>
          Box {formatSize(computed.size, unit)}
          <br />
          Foam {(computed.trueVolumeMm3 / 1e6).toFixed(3)} dm³ each
        </>
      ) : computed?.error ? (
        <span className="text-ember">{computed.error}</span>
      ) : null}
    </div>
  );

  return (
    <form
      className="space-y-4"
      onSubmit={(e) => {
        e.preventDefault();
        void submit();
      }}
    >
      {msg && <ResultNotice tone={msg.tone}>{msg.text}</ResultNotice>}
      <div className="grid gap-3 sm:grid-cols-2">
        {target.kind === "library" && (
          <Field label="Kit" name="kit" error={err("kit")} hint="Parts of one kit are listed together.">
            <Input name="kit" list="kits" value={v.kit ?? ""} onChange={set("kit")} error={err("kit")} />
            <datalist id="kits">
              {kits.map((k) => (
                <option key={k} value={k} />
              ))}
            </datalist>
          </Field>
        )}
        <Field
          label="Part name"
          name="name"
          error={err("name")}
          hint={imported ? "Empty: each profile's own name. With several, this goes in front." : undefined}
        >
          <Input name="name" value={v.name ?? ""} onChange={set("name")} error={err("name")} />
        </Field>
        <Field label={target.kind === "job" ? "Quantity" : "Usual quantity"} name={qtyField} error={err(qtyField)}>
          <Input
            name={qtyField}
            inputMode="numeric"
            value={v.quantity ?? ""}
            onChange={set("quantity")}
            error={err(qtyField)}
          />
        </Field>
        <Field label="Grade" name="gradeId" error={err("gradeId")} hint="Empty: any grade will do.">
          <Select name="gradeId" value={v.gradeId ?? ""} onChange={set("gradeId")} error={err("gradeId")}>
            <option value="">Any grade</option>
            {grades.map((g) => (
              <option key={g.id} value={g.id}>
                {g.code}
              </option>
            ))}
          </Select>
        </Field>
        <Field label="Turning in the block" name="rotate" error={err("rotate")}>
          <Select name="rotate" value={v.rotate} onChange={set("rotate")}>
            {ROTATE_RULES.map((r) => (
              <option key={r} value={r}>
                {ROTATE_LABELS[r]}
              </option>
            ))}
          </Select>
        </Field>
      </div>

      <Choices
        legend="Shape"
        name="shape"
        options={SHAPES}
        value={shape}
        onChange={(k) => {
          setShape(k);
          setPreview(null);
        }}
      />

      {shape === "box" && (
        <div className="grid grid-cols-3 gap-3">
          <Field label={`Length ${unit}`} name="length" error={err("size.0", "size")}>
            <Input
              name="length"
              inputMode="decimal"
              value={v.length ?? ""}
              onChange={set("length")}
              error={err("size.0", "size")}
            />
          </Field>
          <Field label={`Width ${unit}`} name="width" error={err("size.1")}>
            <Input
              name="width"
              inputMode="decimal"
              value={v.width ?? ""}
              onChange={set("width")}
              error={err("size.1")}
            />
          </Field>
          <Field label={`Height ${unit}`} name="height" error={err("size.2")}>
            <Input
              name="height"
              inputMode="decimal"
              value={v.height ?? ""}
              onChange={set("height")}
              error={err("size.2")}
            />
          </Field>
        </div>
      )}

      {shape === "naca" && (
        <>
          <WingPanelFields
            v={v}
            set={set}
            err={err}
            unit={unit}
            profile={profile.profile?.kind === "naca" ? profile.profile : null}
            computed={computedBox}
          />
          {fields.profile && (
            <p id="profile-error" className="text-sm text-ember">
              {fields.profile}
            </p>
          )}
        </>
      )}

      {shape === "polygon" && (
        <div className="grid gap-4 md:grid-cols-[1fr_auto]">
          <div className="grid content-start gap-3 sm:grid-cols-2">
            <div className="sm:col-span-2">
              <Field
                label={`Outline points (${unit})`}
                name="points"
                error={err("profile.points", "profile")}
                hint="“x y; x y; …” in the cutting plane, in order round the outline."
              >
                <textarea
                  id="points"
                  name="points"
                  rows={3}
                  value={v.points ?? ""}
                  onChange={set("points")}
                  aria-invalid={err("profile.points", "profile") ? true : undefined}
                  aria-describedby={err("profile.points", "profile") ? "points-error" : undefined}
                  className="block w-full rounded-md border border-bead-strong bg-paper-raised px-3 py-2 font-mono text-sm"
                  placeholder="0 0; 180 0; 180 90; 90 140; 0 90"
                />
              </Field>
            </div>
            {extrudeField}
          </div>
          <div className="space-y-2">
            <SectionPreview
              profile={profile.profile}
              label="Polygon outline"
              width={260}
              height={170}
              dims
              unit={unit}
            />
            {computedBox}
          </div>
        </div>
      )}

      {imported && (
        <div className="@container space-y-3">
          <ProfileImport key={shape} mode={shape} unit={unit} preview={preview} onPreview={setPreview} />
          <div className="grid gap-3 sm:grid-cols-2">
            {extrudeField}
            {preview && (
              <p className="self-end text-sm text-ink-soft" data-testid="import-volume">
                {importedFoam(preview, len(v.extrudeMm))}
              </p>
            )}
          </div>
        </div>
      )}
      <Button type="submit" disabled={busy}>
        {imported && (preview?.profiles.length ?? 0) > 1
          ? `Add ${preview!.profiles.length} parts${target.kind === "library" ? " to the library" : ""}`
          : target.kind === "job"
            ? "Add the part"
            : "Add to the library"}
      </Button>
    </form>
  );
}

/** Foam in the imported parts at this extrusion: "Foam each: Letter O 2.1 dm³, …". */
function importedFoam(preview: ImportPreview, extrudeMm: number | null): string {
  if (!extrudeMm || !(extrudeMm > 0)) return "Give the extrusion to see the foam in each part.";
  const each = preview.profiles.map((p) => `${p.name} ${((p.areaMm2 * extrudeMm) / 1e6).toFixed(3)} dm³`);
  return `Foam each: ${each.join(", ")}.`;
}
