import { api, readJson } from "@/lib/auth/guard";
import { setMachineGrades } from "@/db/queries/machines";
import { machineGradesSchema } from "@/lib/validations/machines";
import { idParam } from "@/lib/params";

type P = { machineId: string };

export const PUT = api<P>("PUT /api/machines/[machineId]/grades", async ({ req, params, user }) => {
  const id = idParam(params.machineId, "That machine");
  const { grades } = await readJson(req, machineGradesSchema);
  return { machine: await setMachineGrades(id, grades, user.id) };
});
