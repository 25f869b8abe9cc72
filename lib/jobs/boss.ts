import PgBoss from "pg-boss";

/**
 * pg-boss on the app's Postgres (schema "pgboss"). The web server only sends jobs; workers
 * (`npm run worker`, any number, on any machine that reaches the database) do them.
 */
const g = globalThis as unknown as { blockyardBoss?: Promise<PgBoss> };

export function createBoss(role: "sender" | "worker"): PgBoss {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error("DATABASE_URL is not set");
  const boss = new PgBoss({
    connectionString: url,
    max: role === "sender" ? 2 : 4,
    // Only workers run maintenance and cron; senders just insert jobs.
    supervise: role === "worker",
    schedule: role === "worker",
  });
  boss.on("error", (e) => console.error("[jobs]", e instanceof Error ? e.message : e));
  return boss;
}

/** The web process's sender, started once. */
export function sender(): Promise<PgBoss> {
  g.blockyardBoss ??= (async () => {
    const boss = createBoss("sender");
    await boss.start();
    return boss;
  })().catch((e) => {
    g.blockyardBoss = undefined;
    throw e;
  });
  return g.blockyardBoss;
}

const queuesMade = new Map<string, Promise<void>>();

/** Creates a queue once per process: concurrent first sends must not race to create it. */
function ensureQueue(boss: PgBoss, queue: string): Promise<void> {
  let made = queuesMade.get(queue);
  if (!made) {
    made = (async () => {
      if (!(await boss.getQueue(queue))) {
        await boss.createQueue(queue).catch(async (e) => {
          if (!(await boss.getQueue(queue))) throw e; // another process made it first: fine
        });
      }
    })();
    made.catch(() => queuesMade.delete(queue));
    queuesMade.set(queue, made);
  }
  return made;
}

export async function enqueue(queue: string, data: object, options: PgBoss.SendOptions = {}): Promise<string | null> {
  const boss = await sender();
  await ensureQueue(boss, queue);
  return boss.send(queue, data, options);
}
