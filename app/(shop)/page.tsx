import type { Metadata } from "next";
import Link from "next/link";
import { requirePage } from "@/lib/auth/guard";
import { getShopSettings } from "@/db/queries/settings";
import { listUsers } from "@/db/queries/users";
import { Card, Notice, PageHeader } from "@/components/ui/card";
import { HotWireCaution } from "@/components/shell/safety-note";
import { CutterFigures, PlannerFigures } from "@/components/home/role-figures";
import { BuyerFigures, ManagerFigures } from "@/components/home/purchasing-figures";
import { ROLE_DUTIES, ROLE_LABELS, type Role } from "@/lib/roles";
import { formatLength } from "@/lib/units";
import { Figure } from "@/components/ui/figure";

export const metadata: Metadata = { title: "Today" };

export default async function HomePage({ searchParams }: { searchParams: Promise<{ denied?: string }> }) {
  const user = await requirePage("/");
  const { denied } = await searchParams;
  const settings = await getShopSettings();
  const has = (r: Role) => user.roles.includes(r);
  const u = settings.displayUnits;
  const people = has("admin") ? await listUsers() : [];

  return (
    <>
      <PageHeader
        title={`Good to see you, ${user.name.split(" ")[0]}`}
        lead={`Signed in as ${user.roles.map((r) => ROLE_LABELS[r]).join(" and ")} at ${settings.shopName}.`}
      />
      {denied && (
        <div className="mb-6">
          <Notice tone="danger">That page belongs to another role. Ask your admin if you need it.</Notice>
        </div>
      )}
      <div className="grid gap-5 md:grid-cols-2">
        {user.roles.map((role) => (
          <Card key={role} title={`${ROLE_LABELS[role]}`}>
            <p className="text-sm text-ink-soft">{ROLE_DUTIES[role]}</p>
            {role === "admin" && (
              <>
                <dl className="mt-3 grid grid-cols-2 gap-3 text-sm">
                  <Figure label="Active people" value={String(people.filter((p) => p.active).length)} />
                  <Figure label="Deactivated" value={String(people.filter((p) => !p.active).length)} />
                </dl>
                <div className="mt-1 flex gap-4 text-sm">
                  <Link className="inline-flex min-h-11 min-w-11 items-center" href="/admin/users">
                    Manage people
                  </Link>
                  <Link className="inline-flex min-h-11 min-w-11 items-center" href="/admin/settings">
                    Shop settings
                  </Link>
                </div>
              </>
            )}
            {role === "planner" && <PlannerFigures />}
            {role === "cutter" && <CutterFigures />}
            {(role === "planner" || role === "cutter") && (
              <dl className="mt-3 grid grid-cols-2 gap-3 text-sm">
                <Figure label="Kerf" value={formatLength(settings.kerf, u)} />
                <Figure label="Face trim" value={formatLength(settings.trim, u)} />
                <Figure label="Defect margin" value={formatLength(settings.defectMargin, u)} />
                <Figure label="Layout rule" value={settings.layout} />
              </dl>
            )}
            {role === "buyer" && <BuyerFigures />}
            {role === "manager" && <ManagerFigures />}
          </Card>
        ))}
      </div>
      {has("cutter") && (
        <div className="mt-6">
          <HotWireCaution />
        </div>
      )}
    </>
  );
}
