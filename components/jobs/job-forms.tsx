"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button } from "@/components/ui/button";

import { Field, Input, Select } from "@/components/ui/field";
import { CsvUpload } from "@/components/ui/csv-upload";
import { JOB_STATUSES, JOB_STATUS_LABELS, type JobStatus } from "@/lib/job-terms";
import { ResultNotice } from "@/components/ui/result-notice";

/** A new job: name, customer or project, due date. Opens the job page when saved. */
export function NewJobForm() {
  const router = useRouter();
  const [fields, setFields] = useState<Record<string, string>>({});
  const [msg, setMsg] = useState<string | null>(null);
  return (
    <form
      className="space-y-3"
      onSubmit={async (e) => {
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        setFields({});
        setMsg(null);
        try {
          const { job } = await send<{ job: { id: number } }>("/api/jobs", "POST", {
            name: fd.get("name"),
            customer: fd.get("customer"),
            dueOn: fd.get("dueOn") || null,
            notes: fd.get("notes"),
          });
          router.push(`/jobs/${job.id}`);
        } catch (err) {
          if (err instanceof ApiError) {
            setFields(err.fields ?? {});
            setMsg(err.message);
          }
        }
      }}
    >
      {msg && <ResultNotice tone="danger">{msg}</ResultNotice>}
      <Field label="Job name" name="name" error={fields.name}>
        <Input name="name" error={fields.name} placeholder="e.g. Kestrel kits, batch 4" />
      </Field>
      <Field label="Customer or project" name="customer" error={fields.customer}>
        <Input name="customer" error={fields.customer} />
      </Field>
      <Field label="Due" name="dueOn" error={fields.dueOn}>
        <Input name="dueOn" type="date" error={fields.dueOn} />
      </Field>
      <Field label="Notes" name="notes" error={fields.notes}>
        <Input name="notes" error={fields.notes} />
      </Field>
      <Button type="submit">Create the job</Button>
    </form>
  );
}

/** Changes the job's status (the planner's call; nesting runs move it along too). */
export function JobStatusControl({ jobId, status }: { jobId: number; status: JobStatus }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  return (
    <div className="space-y-1">
      <label className="block min-w-52 text-sm">
        <span className="block font-medium text-ink-soft">Status</span>
        <Select
          name="status"
          value={status}
          onChange={async (e) => {
            setError(null);
            try {
              await send(`/api/jobs/${jobId}`, "PATCH", { status: e.target.value });
              router.refresh();
            } catch (err) {
              setError(err instanceof ApiError ? err.message : "The status did not change.");
            }
          }}
        >
          {JOB_STATUSES.map((s) => (
            <option key={s} value={s}>
              {JOB_STATUS_LABELS[s]}
            </option>
          ))}
        </Select>
      </label>
      {error && <p className="text-sm text-ember">{error}</p>}
    </div>
  );
}

/** The part-list CSV import on a job page: check, then every row or none. */
export function PartsImport({ jobId }: { jobId: number }) {
  const router = useRouter();
  return (
    <CsvUpload
      url={`/api/jobs/${jobId}/parts/import`}
      template={{ href: "/templates/parts.csv", label: "Download the part list template (CSV)" }}
      hint={
        <>
          Columns: <code>name</code>, <code>quantity</code>, then either <code>length_mm</code>, <code>width_mm</code>,{" "}
          <code>height_mm</code> (a box), or <code>naca</code>, <code>chord_mm</code>, <code>span_mm</code> (+{" "}
          <code>tip_chord_mm</code>, <code>sweep_mm</code>), or <code>polygon</code> (“x y; x y; …”) with{" "}
          <code>extrude_mm</code>. Optional: <code>grade</code>, <code>rotate</code> (any, z, none). Checking changes
          nothing; the import takes every row or none.
        </>
      }
      summaryLabels={{ parts: "part lines", pieces: "pieces", volumeM3: "m³ of foam" }}
      imported={(r) => <>{r.summary.parts ?? r.rows} part lines added to the job.</>}
      onImported={() => router.refresh()}
    />
  );
}
