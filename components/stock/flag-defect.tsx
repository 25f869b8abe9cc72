"use client";

import { formatDate } from "@/lib/format";
import { useEffect, useRef, useState, type FormEvent } from "react";
import Link from "next/link";
import { ApiError, fetcher, readResponse, send } from "@/lib/swr/fetcher";
import { DEFECT_KINDS, DEFECT_LABELS, STATUS_LABELS, type DefectKind } from "@/lib/stock";
import { formatSize, type LengthUnit } from "@/lib/units";
import { Button, buttonClass } from "@/components/ui/button";
import { Card, Notice } from "@/components/ui/card";
import { LiveNotice, ResultNotice } from "@/components/ui/result-notice";
import { useAnnounce } from "@/components/ui/announcer";
import { Field, Input, Select } from "@/components/ui/field";
import { FACE_AT, depthRange, zoneFromMark } from "@/lib/defect-zone";
import { FaceViews, type DrawnRect } from "./face-views";
import type { Vec3 } from "@/lib/nesting";
import { QrScanner } from "./qr-scanner";
import { ZoneEdit } from "./zone-edit";
// What this page reads from the API, as the server types it (type-only imports: erased from the
// client bundle). A block found by a search is a list row; one opened is its detail (parent code too).
import type { BlockDetail } from "@/db/queries/blocks";
import type { Defect } from "@/db/queries/defects";
import type { BlockSummary } from "@/lib/stock-types";

type FoundBlock = BlockSummary & Partial<Pick<BlockDetail, "parentCode">>;
type Zone = Defect;

/** Who is looking: the cutter who flagged a zone, or a planner, may correct or remove it. */
export interface Viewer {
  id: string;
  planner: boolean;
}

const MAX_PHOTO_BYTES = 10 * 1024 * 1024;
const MAX_PHOTOS = 6;
const AXES = [
  { key: "x", name: "length" },
  { key: "y", name: "width" },
  { key: "z", name: "height" },
] as const;
const VIEW_NAMES = { top: "top", front: "front", side: "right end" } as const;

type Coords = { min: [string, string, string]; max: [string, string, string] };
const EMPTY: Coords = { min: ["", "", ""], max: ["", "", ""] };

const num = (s: string) => (s.trim() === "" ? null : Number(s));

/** Client-side checks on the chosen photos (the server checks the bytes again). */
function checkPhotos(files: File[]): string | null {
  if (files.length > MAX_PHOTOS) return `At most ${MAX_PHOTOS} photos at a time; you chose ${files.length}.`;
  for (const f of files) {
    if (f.size > MAX_PHOTO_BYTES)
      return `"${f.name}" is ${(f.size / 1024 / 1024).toFixed(1)} MB; a photo may be at most 10 MB.`;
    if (f.type && !["image/jpeg", "image/png", "image/webp"].includes(f.type))
      return `"${f.name}" is not a JPEG, PNG or WebP photo.`;
  }
  return null;
}

async function uploadPhotos(defectId: number, files: File[]): Promise<void> {
  const form = new FormData();
  for (const f of files) form.append("photos", f);
  const res = await fetch(`/api/defects/${defectId}/photos`, {
    method: "POST",
    body: form,
    headers: { accept: "application/json" },
  });
  await readResponse(res);
}

export function FlagDefect({ initialCode, unit, viewer }: { initialCode?: string; unit: LengthUnit; viewer?: Viewer }) {
  const [code, setCode] = useState(initialCode ?? "");
  const [finding, setFinding] = useState(false);
  const [findError, setFindError] = useState<string | null>(null);
  const announce = useAnnounce();
  // A code not found: said once in the page's live region, focus back on the code to correct it.
  useEffect(() => {
    if (!findError) return;
    announce(findError);
    document.getElementById("code")?.focus();
  }, [findError, announce]);
  const [choices, setChoices] = useState<FoundBlock[]>([]);
  const [block, setBlock] = useState<FoundBlock | null>(null);
  const [zones, setZones] = useState<Zone[]>([]);

  const find = async (wanted: string) => {
    const q = wanted.trim();
    setFindError(null);
    setChoices([]);
    if (!q) return setFindError("Type the block code from its label, e.g. HF-1001.");
    setFinding(true);
    try {
      const { items } = await fetcher<{ items: FoundBlock[] }>(
        `/api/blocks?q=${encodeURIComponent(q)}&status=all&sort=code&pageSize=8`,
      );
      const exact = items.find((b) => b.code.toUpperCase() === q.toUpperCase());
      if (exact) await open(exact.id);
      else if (items.length === 0) setFindError(`No block has a code starting with ${q.toUpperCase()}.`);
      else setChoices(items);
    } catch (e) {
      setFindError(
        e instanceof ApiError ? e.message : "The block could not be looked up. Check the connection and try again.",
      );
    } finally {
      setFinding(false);
    }
  };

  const open = async (id: number) => {
    const r = await fetcher<{ block: FoundBlock; defects: Zone[] }>(`/api/blocks/${id}`);
    setBlock(r.block);
    setZones(r.defects);
    setCode(r.block.code);
    setChoices([]);
  };

  const reload = async () => {
    if (!block) return;
    const r = await fetcher<{ block: FoundBlock; defects: Zone[] }>(`/api/blocks/${block.id}`);
    setZones(r.defects);
  };

  const started = useRef(false);
  // biome-ignore lint/correctness/useExhaustiveDependencies: once, on arrival from a block page (?code=…)
  useEffect(() => {
    if (initialCode && !started.current) {
      started.current = true;
      void find(initialCode);
    }
    // Only on arrival from a block page (?code=…).
  }, []);

  if (!block) {
    return (
      <Card title="Which block?">
        <form
          className="space-y-4"
          onSubmit={(e) => {
            e.preventDefault();
            void find(code);
          }}
        >
          <div className="space-y-1">
            <label htmlFor="code" className="block text-sm font-medium text-ink-soft">
              Block code
            </label>
            <div className="flex flex-wrap gap-3">
              <div className="min-w-48 flex-1">
                <Input
                  name="code"
                  value={code}
                  onChange={(e) => setCode(e.target.value)}
                  autoComplete="off"
                  autoCapitalize="characters"
                  spellCheck={false}
                  error={findError ?? undefined}
                />
              </div>
              <Button type="submit" disabled={finding}>
                {finding ? "Looking…" : "Find block"}
              </Button>
            </div>
            {findError ? (
              <p id="code-error" className="text-sm text-ember">
                {findError}
              </p>
            ) : (
              <p className="text-xs text-ink-faint">
                Printed in large type on the label, e.g. HF-1001, or HF-1001.2 for an offcut.
              </p>
            )}
          </div>
          {choices.length > 0 && (
            <div>
              <p className="mb-2 text-sm text-ink-soft">
                Several blocks start with {code.trim().toUpperCase()}. Which one?
              </p>
              <ul className="flex flex-wrap gap-2">
                {choices.map((b) => (
                  <li key={b.id}>
                    <Button tone="secondary" onClick={() => void open(b.id)}>
                      {b.code} <span className="text-xs text-ink-faint">{b.gradeCode}</span>
                    </Button>
                  </li>
                ))}
              </ul>
            </div>
          )}
        </form>
        <div className="mt-4 border-t border-bead pt-4">
          <QrScanner onCode={(c) => (setCode(c), void find(c))} />
        </div>
      </Card>
    );
  }

  return (
    <div className="space-y-5">
      <section
        className="flex flex-wrap items-center justify-between gap-3 rounded-card border border-bead bg-paper-raised px-5 py-3 shadow-card"
        aria-label="Block"
      >
        <div className="flex flex-wrap items-baseline gap-x-4 gap-y-1">
          <h2 className="text-xl font-semibold tracking-tight">
            <Link href={`/stock/${encodeURIComponent(block.code)}`}>{block.code}</Link>
          </h2>
          <span className="inline-flex items-center gap-1.5 text-sm">
            <span
              aria-hidden
              className="inline-block size-3 rounded-sm border border-ink/20"
              style={{ background: block.colour }}
            />
            {block.gradeCode}
          </span>
          <span className="text-sm text-ink-soft">{formatSize(block.size, unit)}</span>
          <span className="text-sm text-ink-faint">
            lot {block.lot} · {block.location} · {STATUS_LABELS[block.shown]}
            {block.isOffcut && block.parentCode ? ` · offcut of ${block.parentCode}` : ""}
          </span>
        </div>
        <Button tone="quiet" onClick={() => (setBlock(null), setZones([]), setCode(""))}>
          Another block
        </Button>
      </section>
      {(block.shown === "cut" || block.shown === "written_off") && (
        <Notice tone="caution" title={`${block.code} is ${block.shown === "cut" ? "already cut up" : "written off"}`}>
          A zone flagged here is kept for the record only; flag it on the offcut you are holding if there is one.
        </Notice>
      )}
      <ZoneForm key={block.id} block={block} zones={zones} unit={unit} onSaved={reload} viewer={viewer} />
    </div>
  );
}

function ZoneForm({
  block,
  zones,
  unit,
  onSaved,
  viewer,
}: {
  block: FoundBlock;
  zones: Zone[];
  unit: LengthUnit;
  onSaved: () => Promise<void>;
  viewer?: Viewer;
}) {
  const [kind, setKind] = useState<string>("");
  const [coords, setCoords] = useState<Coords>(EMPTY);
  const [note, setNote] = useState("");
  const [files, setFiles] = useState<File[]>([]);
  const [drawnOn, setDrawnOn] = useState<DrawnRect | null>(null);
  const [depthText, setDepthText] = useState("");
  const [fields, setFields] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<{ tone: "success" | "danger" | "caution"; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const [highlight, setHighlight] = useState<number | null>(null);
  const fileInput = useRef<HTMLInputElement>(null);

  const parsed = { min: coords.min.map(num), max: coords.max.map(num) };
  const draft =
    parsed.min.every((v) => v !== null && Number.isFinite(v)) &&
    parsed.max.every((v) => v !== null && Number.isFinite(v))
      ? { min: parsed.min as Vec3, max: parsed.max as Vec3 }
      : null;

  const onDraw = (r: DrawnRect) => {
    // The third axis is the depth into the face: from the face inwards, as deep as the mark is
    // wide (lib/defect-zone.ts), until the person types the depth they found. A depth already
    // typed for that axis is kept.
    const zone = zoneFromMark(r, block.size);
    const d = zone.depthAxis;
    const typed = coords.min[d] !== "" || coords.max[d] !== "";
    setCoords((c) => {
      const next: Coords = { min: [...c.min], max: [...c.max] };
      r.axes.forEach((axis) => {
        next.min[axis] = String(zone.min[axis]);
        next.max[axis] = String(zone.max[axis]);
      });
      if (!typed) {
        next.min[d] = String(zone.min[d]);
        next.max[d] = String(zone.max[d]);
      }
      return next;
    });
    if (!typed) setDepthText(String(zone.depth));
    setDrawnOn(r);
    setFields((f) => {
      const rest = { ...f };
      for (const a of r.axes) {
        delete rest[`min.${a}`];
        delete rest[`max.${a}`];
      }
      return rest;
    });
  };

  const setCoord = (end: "min" | "max", axis: number, value: string) => {
    const next: Coords = { min: [...coords.min], max: [...coords.max] };
    next[end][axis] = value;
    setCoords(next);
    // The depth field follows a depth typed as from/to.
    if (drawnOn && axis === FACE_AT[drawnOn.view].axis) {
      const lo = num(next.min[axis]!);
      const hi = num(next.max[axis]!);
      setDepthText(lo !== null && hi !== null && hi > lo ? String(Math.round((hi - lo) * 100) / 100) : "");
    }
  };

  /** The depth typed in mm from the face the zone was marked on: sets the depth axis from the face in. */
  const setDepth = (value: string) => {
    setDepthText(value);
    if (!drawnOn) return;
    const d = num(value);
    if (d === null || !Number.isFinite(d) || d <= 0) return;
    const axis = FACE_AT[drawnOn.view].axis;
    const [lo, hi] = depthRange(drawnOn.view, d, block.size);
    setCoords((c) => {
      const next: Coords = { min: [...c.min], max: [...c.max] };
      next.min[axis] = String(lo);
      next.max[axis] = String(hi);
      return next;
    });
  };

  const submit = async (e: FormEvent) => {
    e.preventDefault();
    setMessage(null);
    const photoProblem = checkPhotos(files);
    if (photoProblem) {
      setFields({ photos: photoProblem });
      return;
    }
    setBusy(true);
    setFields({});
    let defectId: number;
    try {
      const res = await send<{ id: number }>(`/api/blocks/${block.id}/defects`, "POST", {
        kind: kind || undefined,
        min: parsed.min,
        max: parsed.max,
        note: note.trim() || null,
      });
      defectId = res.id;
    } catch (err) {
      setBusy(false);
      if (err instanceof ApiError) {
        setFields(err.fields ?? {});
        setMessage({ tone: "danger", text: `${err.message} Nothing was saved.` });
      } else setMessage({ tone: "danger", text: "The zone was not saved: the server could not be reached." });
      return;
    }
    const label = DEFECT_LABELS[kind as DefectKind] ?? "Defect";
    let text = `${label} zone flagged on ${block.code}.`;
    let tone: "success" | "caution" = "success";
    if (files.length) {
      try {
        await uploadPhotos(defectId, files);
        text = `${label} zone flagged on ${block.code}, with ${files.length} photo${files.length === 1 ? "" : "s"}.`;
      } catch (err) {
        tone = "caution";
        text = `${label} zone flagged on ${block.code}, but the photos were not stored: ${err instanceof ApiError ? err.message : "the upload failed."} Add them again from the list below.`;
      }
    }
    await onSaved().catch(() => {});
    setKind("");
    setCoords(EMPTY);
    setNote("");
    setFiles([]);
    setDrawnOn(null);
    setDepthText("");
    if (fileInput.current) fileInput.current.value = "";
    setHighlight(defectId);
    setMessage({ tone, text });
    setBusy(false);
  };

  const depthAxis = drawnOn ? FACE_AT[drawnOn.view].axis : null;

  return (
    <div className="space-y-5">
      <Card title="Mark the zone on a face">
        <FaceViews size={block.size} unit={unit} defects={zones} onDraw={onDraw} draft={draft} highlight={highlight} />
      </Card>

      <div className="grid gap-5 lg:grid-cols-[minmax(0,1.2fr)_minmax(0,1fr)]">
        <Card title="What is wrong here?">
          <form className="space-y-5" onSubmit={submit} noValidate>
            {message && <ResultNotice tone={message.tone}>{message.text}</ResultNotice>}
            <Field label="Kind of defect" name="kind" error={fields.kind}>
              <Select name="kind" value={kind} onChange={(e) => setKind(e.target.value)} error={fields.kind}>
                <option value="">Choose…</option>
                {DEFECT_KINDS.map((k) => (
                  <option key={k} value={k}>
                    {DEFECT_LABELS[k]}
                  </option>
                ))}
              </Select>
            </Field>

            <fieldset>
              <legend className="mb-1 text-sm font-medium text-ink-soft">Where, in mm from the origin corner</legend>
              {drawnOn && depthAxis !== null ? (
                <div className="mb-3 space-y-2">
                  <p className="text-xs text-ink-faint" data-testid="drawn-hint">
                    Drawn on the {VIEW_NAMES[drawnOn.view]} face: {AXES[drawnOn.axes[0]].key} and{" "}
                    {AXES[drawnOn.axes[1]].key} come from your drawing. How deep it goes ({AXES[depthAxis].key},{" "}
                    {AXES[depthAxis].name}) cannot be drawn: it starts as deep as the mark is wide, from that face in.
                    Type the depth you found; if it lies further inside, type its from and to below.
                  </p>
                  <Field
                    label={`Depth from the ${VIEW_NAMES[drawnOn.view]} face (mm)`}
                    name="depth"
                    error={fields[`min.${depthAxis}`] ?? fields[`max.${depthAxis}`]}
                    hint={`0 – ${block.size[depthAxis]} mm`}
                  >
                    <Input
                      name="depth"
                      inputMode="decimal"
                      type="number"
                      min={0}
                      max={block.size[depthAxis]}
                      step="any"
                      value={depthText}
                      onChange={(e) => setDepth(e.target.value)}
                      error={fields[`min.${depthAxis}`] ?? fields[`max.${depthAxis}`]}
                    />
                  </Field>
                </div>
              ) : (
                <p className="mb-2 text-xs text-ink-faint">Drag on a face above, or type the box here.</p>
              )}
              <div className="grid grid-cols-[auto_1fr_1fr] items-start gap-x-3 gap-y-2">
                <span />
                <span className="text-xs font-medium text-ink-faint">from</span>
                <span className="text-xs font-medium text-ink-faint">to</span>
                {AXES.map((ax, i) => (
                  <AxisRow
                    key={ax.key}
                    i={i}
                    label={`${ax.key} · ${ax.name}`}
                    limit={block.size[i]!}
                    coords={coords}
                    fields={fields}
                    onChange={setCoord}
                  />
                ))}
              </div>
            </fieldset>

            <Field label="Note" name="note" error={fields.note} hint="Optional: how it was found, how deep it seemed.">
              <Input
                name="note"
                value={note}
                onChange={(e) => setNote(e.target.value)}
                maxLength={500}
                error={fields.note}
              />
            </Field>

            <Field
              label="Photos"
              name="photos"
              error={fields.photos}
              hint="JPEG, PNG or WebP, up to 10 MB each, at most 6."
            >
              <input
                ref={fileInput}
                id="photos"
                name="photos"
                type="file"
                accept="image/jpeg,image/png,image/webp"
                multiple
                onChange={(e) => {
                  const chosen = Array.from(e.target.files ?? []);
                  setFiles(chosen);
                  const problem = checkPhotos(chosen);
                  setFields((f) => {
                    const { photos: _drop, ...rest } = f;
                    return problem ? { ...rest, photos: problem } : rest;
                  });
                }}
                className="block w-full text-sm text-ink-soft file:mr-3 file:min-h-11 file:rounded-md file:border file:border-bead-strong file:bg-paper-raised file:px-4 file:text-sm file:font-medium file:text-ink hover:file:bg-paper-sunk"
              />
            </Field>
            {files.length > 0 && <PhotoPreviews files={files} />}

            <Button type="submit" disabled={busy} className="w-full sm:w-auto">
              {busy ? "Saving…" : "Save the zone"}
            </Button>
          </form>
        </Card>

        <Card title={`Zones on ${block.code} (${zones.length})`}>
          <ZoneList
            block={block}
            zones={zones}
            unit={unit}
            onHover={setHighlight}
            onPhotos={onSaved}
            highlight={highlight}
            viewer={viewer}
          />
        </Card>
      </div>
    </div>
  );
}

function AxisRow({
  i,
  label,
  limit,
  coords,
  fields,
  onChange,
}: {
  i: number;
  label: string;
  limit: number;
  coords: Coords;
  fields: Record<string, string>;
  onChange: (end: "min" | "max", axis: number, v: string) => void;
}) {
  const errMin = fields[`min.${i}`];
  const errMax = fields[`max.${i}`];
  const control = (end: "min" | "max", err?: string) => (
    <div className="space-y-1">
      <Input
        name={`${end}.${i}`}
        aria-label={`${label} ${end === "min" ? "from" : "to"} (mm)`}
        inputMode="decimal"
        type="number"
        min={0}
        max={limit}
        step="any"
        value={coords[end][i]}
        onChange={(e) => onChange(end, i, e.target.value)}
        error={err}
      />
      {err && (
        <p id={`${end}.${i}-error`} className="text-sm text-ember">
          {err}
        </p>
      )}
    </div>
  );
  return (
    <>
      <span className="pt-2.5 text-sm whitespace-nowrap text-ink-soft">
        {label}
        <span className="block text-xs text-ink-faint">0 – {limit} mm</span>
      </span>
      {control("min", errMin)}
      {control("max", errMax)}
    </>
  );
}

function PhotoPreviews({ files }: { files: File[] }) {
  const [urls, setUrls] = useState<string[]>([]);
  useEffect(() => {
    const made = files.map((f) => URL.createObjectURL(f));
    setUrls(made);
    return () => made.forEach((u) => URL.revokeObjectURL(u));
  }, [files]);
  return (
    <ul className="flex flex-wrap gap-2" aria-label="Photos to attach">
      {urls.map((u, i) => (
        <li key={u}>
          <img src={u} alt={files[i]?.name ?? "photo"} className="size-20 rounded-md border border-bead object-cover" />
        </li>
      ))}
    </ul>
  );
}

function ZoneList({
  block,
  zones,
  unit,
  highlight,
  onHover,
  onPhotos,
  viewer,
}: {
  block: FoundBlock;
  zones: Zone[];
  unit: LengthUnit;
  highlight: number | null;
  onHover: (id: number | null) => void;
  onPhotos: () => Promise<void>;
  viewer?: Viewer;
}) {
  if (!zones.length) return <p className="text-sm text-ink-faint">No zones flagged on this block yet.</p>;
  return (
    <ul className="divide-y divide-bead">
      {[...zones].reverse().map((z) => (
        <li
          key={z.id}
          data-testid={`zone-${z.id}`}
          className={`py-3 first:pt-0 last:pb-0 ${highlight === z.id ? "bg-wire-light/40" : ""}`}
          onMouseEnter={() => onHover(z.id)}
          onFocus={() => onHover(z.id)}
        >
          <div className="flex items-baseline justify-between gap-3">
            <p className="font-medium">{DEFECT_LABELS[z.kind] ?? z.kind}</p>
            <p className="text-xs text-ink-faint">
              {z.foundBy ?? "someone"} · {formatDate(z.foundAt)}
            </p>
          </div>
          <p className="text-sm text-ink-soft" style={{ fontVariantNumeric: "tabular-nums" }}>
            x {z.min[0]}–{z.max[0]} · y {z.min[1]}–{z.max[1]} · z {z.min[2]}–{z.max[2]} mm
            {unit === "in" && (
              <span className="block text-xs text-ink-faint">
                {formatSize([z.max[0] - z.min[0], z.max[1] - z.min[1], z.max[2] - z.min[2]], "in")} box
              </span>
            )}
          </p>
          {z.note && <p className="text-sm text-ink-faint">{z.note}</p>}
          <div className="mt-2 flex flex-wrap items-center gap-2">
            {z.photos.map((p) => (
              <a key={p.id} href={`/api/photos/${p.id}`} target="_blank" rel="noreferrer" className="block">
                <img
                  src={`/api/photos/${p.id}?size=thumb`}
                  alt={`The ${DEFECT_LABELS[z.kind] ?? "defect"} zone`}
                  className="h-16 w-20 rounded-md border border-bead object-cover"
                  loading="lazy"
                />
              </a>
            ))}
            <AddPhotos defectId={z.id} onDone={onPhotos} />
          </div>
          {viewer && (viewer.planner || z.foundById === viewer.id) && (
            <div className="mt-2">
              <ZoneEdit
                zone={{ id: z.id, kind: z.kind, min: z.min, max: z.max, note: z.note }}
                blockCode={block.code}
                size={block.size}
                onDone={onPhotos}
              />
            </div>
          )}
        </li>
      ))}
    </ul>
  );
}

function AddPhotos({ defectId, onDone }: { defectId: number; onDone: () => Promise<void> }) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const id = `add-photos-${defectId}`;
  return (
    <div>
      <label htmlFor={id} className={buttonClass("quiet", `cursor-pointer text-sm ${busy ? "opacity-60" : ""}`)}>
        {busy ? "Uploading…" : "Add photos"}
      </label>
      <input
        id={id}
        type="file"
        accept="image/jpeg,image/png,image/webp"
        multiple
        className="sr-only"
        disabled={busy}
        onChange={async (e) => {
          const chosen = Array.from(e.target.files ?? []);
          e.target.value = "";
          if (!chosen.length) return;
          const problem = checkPhotos(chosen);
          if (problem) return setError(problem);
          setBusy(true);
          setError(null);
          try {
            await uploadPhotos(defectId, chosen);
            await onDone();
          } catch (err) {
            setError(err instanceof ApiError ? err.message : "The photos were not stored; try again.");
          } finally {
            setBusy(false);
          }
        }}
      />
      {error && <LiveNotice tone="danger">{error}</LiveNotice>}
    </div>
  );
}
