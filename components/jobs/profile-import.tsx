"use client";

import { useRef, useState, type KeyboardEvent } from "react";
import { Button } from "@/components/ui/button";
import { Choices, Field, Input, Select } from "@/components/ui/field";
import { LiveNotice } from "@/components/ui/result-notice";
import { plural } from "@/lib/format";
import type { Point } from "@/lib/profiles";
import { formatLength, lengthToMm, type LengthUnit } from "@/lib/units";
import { ProfileSheet } from "./section-preview";

/** A profile as POST /api/profiles/import gives it (mm, box starting at 0, 0). */
export interface PreviewProfile {
  name: string;
  points: Point[];
  holes: Point[][];
  source: string;
  boxMm: [number, number];
  areaMm2: number;
}

export interface ImportPreview {
  profiles: PreviewProfile[];
  notes: string[];
}

interface Problem {
  message: string;
  subject?: string;
  field?: string;
}

/** The import route's field names, as this form names its controls (ids are page-wide). */
const FIELD_IDS: Record<string, string> = {
  file: "drawingFile",
  svgPath: "svgPath",
  unit: "drawingUnit",
  text: "letters",
  heightMm: "letterHeight",
  spacingMm: "letterSpacing",
  heightOf: "heightOf",
  font: "fontFile",
};

const UNITS = [
  ["", "As the file says"],
  ["mm", "mm"],
  ["cm", "cm"],
  ["m", "m"],
  ["in", "inches"],
  ["ft", "feet"],
] as const;

/**
 * "From a drawing" (a DXF or SVG file, or a pasted SVG path) and "Text" (letters in the shipped
 * font or an uploaded one): sends them to POST /api/profiles/import, which stores nothing, and
 * draws what comes back to scale, each profile named. Problems show beside the control they belong
 * to; a drawing without a unit asks for one. The parent form adds the parts.
 */
const JOINED: [string, string][] = [
  ["0", "Each letter a part"],
  ["1", "One joined part"],
];
const FONTS: [string, string][] = [
  ["shipped", "Inter Bold (comes with Blockyard, SIL Open Font License)"],
  ["upload", "A font file of the shop's"],
];

export function ProfileImport({
  mode,
  unit,
  preview,
  onPreview,
}: {
  mode: "drawing" | "text";
  unit: LengthUnit;
  preview: ImportPreview | null;
  onPreview: (p: ImportPreview | null) => void;
}) {
  const [v, setV] = useState<Record<string, string>>({
    drawingUnit: "",
    svgPath: "",
    letters: "",
    letterHeight: "",
    letterSpacing: "",
    heightOf: "cap",
    joined: "0",
    font: "shipped",
  });
  const [fields, setFields] = useState<Record<string, string>>({});
  const [problems, setProblems] = useState<Problem[]>([]);
  const [notes, setNotes] = useState<string[]>([]);
  const [needsUnit, setNeedsUnit] = useState(false);
  const [busy, setBusy] = useState(false);
  const drawingFile = useRef<File | null>(null);
  const fontFile = useRef<File | null>(null);
  const set = (k: string) => (e: { target: { value: string } }) => setV((s) => ({ ...s, [k]: e.target.value }));

  async function read(over: Record<string, string> = {}) {
    const now = { ...v, ...over };
    const form = new FormData();
    if (mode === "drawing") {
      if (drawingFile.current) form.append("file", drawingFile.current);
      else form.append("svgPath", now.svgPath ?? "");
      if (now.drawingUnit) form.append("unit", now.drawingUnit);
    } else {
      form.append("text", now.letters ?? "");
      const mm = (s: string | undefined) => (s?.trim() ? String(lengthToMm(Number(s), unit)) : "");
      form.append("heightMm", mm(now.letterHeight));
      form.append("spacingMm", mm(now.letterSpacing));
      form.append("heightOf", now.heightOf ?? "cap");
      form.append("joined", now.joined === "1" ? "1" : "0");
      if (now.font === "upload" && fontFile.current) form.append("font", fontFile.current);
    }
    setBusy(true);
    setFields({});
    setProblems([]);
    setNotes([]);
    try {
      const res = await fetch("/api/profiles/import", {
        method: "POST",
        body: form,
        headers: { accept: "application/json" },
      });
      const body = (await res.json().catch(() => ({}))) as {
        error?: string;
        fields?: Record<string, string>;
        errors?: Problem[];
        notes?: string[];
        needsUnit?: boolean;
        profiles?: PreviewProfile[];
      };
      if (res.ok && body.profiles) {
        setNeedsUnit(false);
        setNotes(body.notes ?? []);
        onPreview({ profiles: body.profiles, notes: body.notes ?? [] });
        return;
      }
      onPreview(null);
      const mapped: Record<string, string> = {};
      for (const [k, m] of Object.entries(body.fields ?? {})) mapped[FIELD_IDS[k] ?? k] = m;
      if (!Object.keys(mapped).length)
        mapped[mode === "drawing" ? "drawingFile" : "letters"] = body.error ?? `The server refused it (${res.status}).`;
      setFields(mapped);
      setProblems(body.errors ?? []);
      setNotes(body.notes ?? []);
      setNeedsUnit(Boolean(body.needsUnit));
    } catch {
      onPreview(null);
      setFields({ [mode === "drawing" ? "drawingFile" : "letters"]: "The server could not be reached; try again." });
    } finally {
      setBusy(false);
    }
  }

  // Enter in the text fields draws the letters, rather than adding the part.
  const enterReads = (e: KeyboardEvent) => {
    if (e.key === "Enter") {
      e.preventDefault();
      void read();
    }
  };
  const extra = problems.slice(1);
  const unitSelect = (
    <Field
      label="Drawing unit"
      name="drawingUnit"
      error={fields.drawingUnit}
      hint={needsUnit ? undefined : "Used when the drawing does not say its own."}
    >
      <Select
        name="drawingUnit"
        value={v.drawingUnit}
        error={fields.drawingUnit}
        onChange={(e) => {
          set("drawingUnit")(e);
          if (drawingFile.current || v.svgPath?.trim()) void read({ drawingUnit: e.target.value });
        }}
      >
        {UNITS.map(([k, label]) => (
          <option key={k} value={k}>
            {label}
          </option>
        ))}
      </Select>
    </Field>
  );

  return (
    <div className="space-y-3" data-testid="profile-import">
      {mode === "drawing" ? (
        <div className="grid gap-3 @lg:grid-cols-2">
          <Field
            label="Drawing file (DXF or SVG)"
            name="drawingFile"
            error={fields.drawingFile}
            hint="Closed outlines; holes are the outlines inside others."
          >
            <Input
              type="file"
              name="drawingFile"
              accept=".dxf,.svg,image/svg+xml,application/dxf"
              error={fields.drawingFile}
              onChange={(e) => {
                drawingFile.current = e.target.files?.[0] ?? null;
                if (drawingFile.current) void read();
                else onPreview(null);
              }}
            />
          </Field>
          {unitSelect}
          <div className="@lg:col-span-2">
            <Field
              label="…or paste an SVG path"
              name="svgPath"
              error={fields.svgPath}
              hint="The d of a path, e.g. “M0 0 H120 V60 H0 Z”, in the drawing unit above."
            >
              <textarea
                id="svgPath"
                name="svgPath"
                rows={2}
                value={v.svgPath}
                onChange={set("svgPath")}
                disabled={Boolean(drawingFile.current)}
                aria-invalid={fields.svgPath ? true : undefined}
                aria-describedby={fields.svgPath ? "svgPath-error" : undefined}
                className={`block w-full rounded-md border bg-paper-raised px-3 py-2 font-mono text-sm ${fields.svgPath ? "border-ember" : "border-bead-strong"}`}
              />
            </Field>
          </div>
        </div>
      ) : (
        <div className="grid gap-3 @lg:grid-cols-2">
          <div className="@lg:col-span-2">
            <Field label="Text to cut" name="letters" error={fields.letters} hint="One line, up to 60 characters.">
              <Input
                name="letters"
                onKeyDown={enterReads}
                value={v.letters}
                onChange={set("letters")}
                error={fields.letters}
                maxLength={120}
              />
            </Field>
          </div>
          <Field label={`Letter height ${unit}`} name="letterHeight" error={fields.letterHeight}>
            <Input
              name="letterHeight"
              onKeyDown={enterReads}
              inputMode="decimal"
              value={v.letterHeight}
              onChange={set("letterHeight")}
              error={fields.letterHeight}
            />
          </Field>
          <Field label="The height is" name="heightOf" error={fields.heightOf}>
            <Select name="heightOf" value={v.heightOf} onChange={set("heightOf")} error={fields.heightOf}>
              <option value="cap">of a capital letter (H)</option>
              <option value="overall">of the whole text, top to bottom</option>
            </Select>
          </Field>
          <Field
            label={`Letter spacing ${unit}`}
            name="letterSpacing"
            error={fields.letterSpacing}
            hint="Added between letters; negative closes them up."
          >
            <Input
              name="letterSpacing"
              onKeyDown={enterReads}
              inputMode="decimal"
              value={v.letterSpacing}
              onChange={set("letterSpacing")}
              error={fields.letterSpacing}
            />
          </Field>
          <Choices
            legend="Parts"
            name="joined"
            options={JOINED}
            value={v.joined ?? "0"}
            onChange={(joined) => setV((s) => ({ ...s, joined }))}
            hint="Joined letters that do not touch stand on a base rail."
          />
          <div className="@lg:col-span-2">
            <Choices
              legend="Font"
              name="font"
              options={FONTS}
              value={v.font ?? "shipped"}
              onChange={(font) => setV((s) => ({ ...s, font }))}
            />
            {v.font === "upload" && (
              <div className="mt-2 max-w-md">
                <Field label="Font file (TTF, OTF or WOFF)" name="fontFile" error={fields.fontFile}>
                  <Input
                    type="file"
                    name="fontFile"
                    accept=".ttf,.otf,.woff,font/ttf,font/otf,font/woff"
                    error={fields.fontFile}
                    onChange={(e) => {
                      fontFile.current = e.target.files?.[0] ?? null;
                    }}
                  />
                </Field>
              </div>
            )}
          </div>
        </div>
      )}
      <div className="flex flex-wrap items-center gap-3">
        <Button type="button" tone="secondary" disabled={busy} onClick={() => void read()}>
          {mode === "drawing" ? "Read the drawing" : "Draw the letters"}
        </Button>
        {busy && <span className="text-sm text-ink-soft">Reading…</span>}
      </div>
      {extra.length > 0 && (
        <LiveNotice tone="danger" title={`${plural(problems.length, "problem")} in the drawing`}>
          <ul className="list-disc pl-5" data-testid="import-problems">
            {problems.map((p) => (
              <li key={`${p.subject ?? ""}|${p.message}`}>{p.message}</li>
            ))}
          </ul>
        </LiveNotice>
      )}
      {notes.length > 0 && (
        <ul className="space-y-1 text-sm text-ink-soft" data-testid="import-notes">
          {notes.map((n) => (
            <li key={n}>{n}</li>
          ))}
        </ul>
      )}
      {preview && (
        <figure className="space-y-2">
          <ProfileSheet profiles={preview.profiles} unit={unit} label="To scale" />
          <figcaption className="text-sm text-ink-soft" data-testid="import-summary">
            {plural(preview.profiles.length, "profile")}:{" "}
            {preview.profiles
              .map((p) => `${p.name} ${formatLength(p.boxMm[0], unit)} × ${formatLength(p.boxMm[1], unit)}`)
              .join("; ")}
          </figcaption>
        </figure>
      )}
    </div>
  );
}
