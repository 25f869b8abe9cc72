import { api } from "@/lib/auth/guard";
import { sendLowStockAlerts } from "@/lib/jobs/handlers/low-stock-alert";

/** Sends the low-stock alert now (the same work the scheduled job does), and says what went. */
export const POST = api("POST /api/reorder/alert", async ({ user }) => sendLowStockAlerts(user.id));
