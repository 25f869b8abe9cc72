import { api } from "@/lib/auth/guard";

export const GET = api("GET /api/me", async ({ user }) => ({ user }));
