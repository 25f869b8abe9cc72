import { api, readJson } from "@/lib/auth/guard";
import { getMachine, updateMachine } from "@/db/queries/machines";
import { machineSchema } from "@/lib/validations/machines";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { machineId: string };

export const GET = api<P>("GET /api/machines/[machineId]", async ({ params }) => {
  const machine = await getMachine(idParam(params.machineId, "That machine"));
  if (!machine) throw notFound("That machine");
  return { machine };
});

export const PUT = api<P>("PUT /api/machines/[machineId]", async ({ req, params, user }) => {
  const id = idParam(params.machineId, "That machine");
  const input = await readJson(req, machineSchema);
  return { machine: await updateMachine(id, input, user.id) };
});
