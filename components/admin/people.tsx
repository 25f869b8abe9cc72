"use client";

import { useState } from "react";
import { useUsers, type UserRow } from "@/lib/swr/use-users";
import { ApiError, send } from "@/lib/swr/fetcher";
import { ROLES, ROLE_LABELS, type Role } from "@/lib/roles";
import { Button } from "@/components/ui/button";
import { Field, Input } from "@/components/ui/field";
import { Badge, Card } from "@/components/ui/card";
import { ResultNotice } from "@/components/ui/result-notice";

export function People({ initial, selfId }: { initial: UserRow[]; selfId: string }) {
  const { data, mutate } = useUsers(initial);
  const [message, setMessage] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const users = data?.items ?? initial;

  async function run(action: () => Promise<unknown>, ok: string) {
    setMessage(null);
    try {
      await action();
      setMessage({ tone: "success", text: ok });
      await mutate();
    } catch (e) {
      setMessage({ tone: "danger", text: e instanceof ApiError ? e.message : "The change was not saved." });
    }
  }

  return (
    <div className="space-y-6">
      {message && <ResultNotice tone={message.tone}>{message.text}</ResultNotice>}
      <NewPerson
        onCreated={async (name) => {
          setMessage({ tone: "success", text: `${name} can now sign in with the temporary password.` });
          await mutate();
        }}
      />
      <Card title={`People (${users.length})`}>
        <ul className="divide-y divide-bead">
          {users.map((u) => (
            <PersonRow key={u.id} user={u} isSelf={u.id === selfId} run={run} />
          ))}
        </ul>
      </Card>
    </div>
  );
}

function PersonRow({
  user,
  isSelf,
  run,
}: {
  user: UserRow;
  isSelf: boolean;
  run: (a: () => Promise<unknown>, ok: string) => Promise<void>;
}) {
  const [roles, setRoles] = useState<Role[]>(user.roles);
  const [temp, setTemp] = useState("");
  const changed = roles.slice().sort().join() !== user.roles.slice().sort().join();
  return (
    <li className="grid gap-3 py-4 md:grid-cols-[1fr_auto]" data-testid={`person-${user.email}`}>
      <div>
        <p className="font-medium">
          {user.name} {isSelf && <Badge tone="kerf">you</Badge>}{" "}
          {!user.active && <Badge tone="ember">deactivated</Badge>}{" "}
          {user.mustChangePassword && user.active && <Badge tone="wire">temporary password</Badge>}
        </p>
        <p className="text-sm text-ink-soft">{user.email}</p>
        <fieldset className="mt-2 flex flex-wrap gap-x-4 gap-y-1" aria-label={`Roles of ${user.name}`}>
          {ROLES.map((r) => (
            <label key={r} className="flex min-h-11 items-center gap-2 text-sm">
              <input
                type="checkbox"
                className="size-5 accent-kerf"
                checked={roles.includes(r)}
                onChange={(e) => setRoles(e.target.checked ? [...roles, r] : roles.filter((x) => x !== r))}
              />
              {ROLE_LABELS[r]}
            </label>
          ))}
        </fieldset>
      </div>
      <div className="flex flex-wrap items-start gap-2 md:justify-end">
        {changed && (
          <Button
            onClick={() =>
              run(() => send(`/api/admin/users/${user.id}`, "PATCH", { roles }), `Roles of ${user.name} saved.`)
            }
          >
            Save roles
          </Button>
        )}
        <form
          className="flex gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            void run(
              () => send(`/api/admin/users/${user.id}/password`, "POST", { password: temp }),
              `Temporary password set for ${user.name}; their sessions were ended.`,
            ).then(() => setTemp(""));
          }}
        >
          <label className="sr-only" htmlFor={`temp-${user.id}`}>
            Temporary password for {user.name}
          </label>
          <input
            id={`temp-${user.id}`}
            type="text"
            value={temp}
            onChange={(e) => setTemp(e.target.value)}
            placeholder="Temporary password"
            className="min-h-11 w-44 rounded-md border border-bead-strong bg-paper-raised px-3 text-sm"
          />
          <Button tone="secondary" type="submit" disabled={temp.length === 0}>
            Set
          </Button>
        </form>
        {!isSelf &&
          (user.active ? (
            <Button
              tone="danger"
              onClick={() =>
                run(
                  () => send(`/api/admin/users/${user.id}`, "PATCH", { active: false }),
                  `${user.name} was deactivated and signed out everywhere.`,
                )
              }
            >
              Deactivate
            </Button>
          ) : (
            <Button
              tone="secondary"
              onClick={() =>
                run(
                  () => send(`/api/admin/users/${user.id}`, "PATCH", { active: true }),
                  `${user.name} can sign in again.`,
                )
              }
            >
              Reactivate
            </Button>
          ))}
      </div>
    </li>
  );
}

function NewPerson({ onCreated }: { onCreated: (name: string) => Promise<void> }) {
  const [fields, setFields] = useState<Record<string, string>>({});
  const [error, setError] = useState<string | null>(null);
  const [roles, setRoles] = useState<Role[]>([]);
  const [busy, setBusy] = useState(false);
  return (
    <Card title="Add a person">
      <form
        className="grid gap-4 md:grid-cols-2"
        onSubmit={async (e) => {
          e.preventDefault();
          const form = e.currentTarget;
          const fd = new FormData(form);
          setBusy(true);
          setFields({});
          setError(null);
          try {
            await send("/api/admin/users", "POST", {
              name: fd.get("name"),
              email: fd.get("email"),
              password: fd.get("password"),
              roles,
            });
            const name = String(fd.get("name"));
            form.reset();
            setRoles([]);
            await onCreated(name);
          } catch (err) {
            if (err instanceof ApiError) {
              setFields(err.fields ?? {});
              setError(err.message);
            } else setError("The person was not added.");
          } finally {
            setBusy(false);
          }
        }}
      >
        {error && (
          <div className="md:col-span-2">
            <ResultNotice tone="danger">{error}</ResultNotice>
          </div>
        )}
        <Field label="Name" name="name" error={fields.name}>
          <Input name="name" error={fields.name} />
        </Field>
        <Field label="E-mail" name="email" error={fields.email}>
          <Input name="email" type="email" error={fields.email} />
        </Field>
        <Field
          label="Temporary password"
          name="password"
          error={fields.password}
          hint="At least 10 characters. They choose their own at first sign-in."
        >
          <Input name="password" type="text" autoComplete="off" error={fields.password} />
        </Field>
        <fieldset aria-describedby={fields.roles ? "roles-error" : undefined}>
          <legend className="text-sm font-medium text-ink-soft">Roles</legend>
          <div className="mt-1 flex flex-wrap gap-x-4">
            {ROLES.map((r) => (
              <label key={r} className="flex min-h-11 items-center gap-2 text-sm">
                <input
                  type="checkbox"
                  className="size-5 accent-kerf"
                  checked={roles.includes(r)}
                  onChange={(e) => setRoles(e.target.checked ? [...roles, r] : roles.filter((x) => x !== r))}
                />
                {ROLE_LABELS[r]}
              </label>
            ))}
          </div>
          {fields.roles && (
            <p id="roles-error" className="text-sm text-ember">
              {fields.roles}
            </p>
          )}
        </fieldset>
        <div className="md:col-span-2">
          <Button type="submit" disabled={busy}>
            {busy ? "Adding…" : "Add person"}
          </Button>
        </div>
      </form>
    </Card>
  );
}
