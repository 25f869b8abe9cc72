import { NextResponse } from "next/server";
import { api } from "@/lib/auth/guard";
import { pingDatabase } from "@/db/queries/settings";
import { APP_VERSION } from "@/lib/env";

export const dynamic = "force-dynamic";

export const GET = api("GET /api/health", async () => {
  const up = await pingDatabase();
  return NextResponse.json({ ok: up, version: APP_VERSION, database: up ? "up" : "down" }, { status: up ? 200 : 503 });
});
