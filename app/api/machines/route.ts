import { NextResponse } from "next/server";
import { api, readJson } from "@/lib/auth/guard";
import { createMachine, listMachines } from "@/db/queries/machines";
import { machineSchema } from "@/lib/validations/machines";

export const GET = api("GET /api/machines", async () => ({ items: await listMachines() }));

export const POST = api("POST /api/machines", async ({ req, user }) => {
  const input = await readJson(req, machineSchema);
  return NextResponse.json({ machine: await createMachine(input, user.id) }, { status: 201 });
});
