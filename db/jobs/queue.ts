// The Postgres-backed job queue (pg-boss) shared by the app (to enqueue) and the worker (to run).
import PgBoss from "pg-boss";

export const QUEUES = {
  reminderScan: "reminder-scan",
  sendReminder: "send-reminder",
  photoProcess: "photo-process",
  orphanSweep: "orphan-sweep",
  desiccantScan: "desiccant-scan",
  locationAlertScan: "location-alert-scan",
  locationDigest: "location-digest",
} as const;

const g = globalThis as unknown as { rustlineBoss?: Promise<PgBoss> };

export function getBoss(): Promise<PgBoss> {
  if (!g.rustlineBoss) {
    g.rustlineBoss = (async () => {
      const boss = new PgBoss({ connectionString: process.env.DATABASE_URL, max: 4 });
      boss.on("error", (err) => console.error("[queue]", err.message));
      await boss.start();
      for (const name of Object.values(QUEUES)) {
        await boss.createQueue(name).catch(() => undefined);
      }
      return boss;
    })().catch((err) => {
      g.rustlineBoss = undefined;
      throw err;
    });
  }
  return g.rustlineBoss;
}

export async function stopBoss() {
  if (g.rustlineBoss) {
    const boss = await g.rustlineBoss;
    g.rustlineBoss = undefined;
    await boss.stop({ graceful: true, timeout: 5000 });
  }
}
