// The background worker started by `npm start`: inspection and desiccant reminders, collection alerts,
// photo previews and the orphan sweep, all from the pg-boss queue on the same PostgreSQL.
import { getBoss, QUEUES, stopBoss } from "@/db/jobs/queue";
import { claimDueReminders, reclaimStaleReminders, sendReminder, type ReminderJob } from "@/db/jobs/reminders";
import { runDesiccantScan } from "@/db/jobs/desiccant";
import { runLocationAlertScan, runLocationDigest } from "@/db/jobs/location-alerts";
import { refreshStaleLocationStatuses } from "@/db/queries/location-status";
import { registerPhotoJobs } from "@/db/jobs/photos";
import { closeDb } from "@/db/client";

const pollS = Number(process.env.WORKER_POLL_S ?? 2);
// First retry after this many seconds, doubling each time (pg-boss backoff) while mail is down.
const retryDelayS = Number(process.env.REMINDER_RETRY_DELAY_S ?? 30);

async function scanOnce() {
  const boss = await getBoss();
  const jobs = [...(await claimDueReminders()), ...(await reclaimStaleReminders())];
  for (const j of jobs) {
    await boss.send(QUEUES.sendReminder, j, { retryLimit: 30, retryDelay: retryDelayS, retryBackoff: true, expireInSeconds: 120 });
  }
  if (jobs.length) console.log(`[worker] queued ${jobs.length} reminder(s)`);
}

async function main() {
  const boss = await getBoss();
  await boss.work<ReminderJob>(QUEUES.sendReminder, { pollingIntervalSeconds: Math.max(0.5, pollS) }, async ([job]) => {
    const r = await sendReminder(job.data);
    console.log(`[worker] reminder ${job.data.kind} for ${job.data.inspectionId}: ${r}`);
  });
  await boss.work(QUEUES.reminderScan, { pollingIntervalSeconds: Math.max(0.5, pollS) }, async () => scanOnce());
  // Scan every minute; tests and the app can also request a scan by sending a reminder-scan job.
  await boss.schedule(QUEUES.reminderScan, "* * * * *");
  await registerPhotoJobs(boss, pollS);
  // Desiccant exhaustion reminders: hourly scan; a failed mail makes the job throw and pg-boss retry it.
  await boss.work(QUEUES.desiccantScan, { pollingIntervalSeconds: Math.max(0.5, pollS) }, async () => {
    const r = await runDesiccantScan();
    if (r.claimed || r.sent) console.log(`[worker] desiccant reminders: ${r.claimed} claimed, ${r.sent} sent`);
  });
  await boss.schedule(QUEUES.desiccantScan, "17 * * * *", undefined, { retryLimit: 5, retryDelay: 60, retryBackoff: true });
  // Collection alerts: a scan every 10 minutes (claims are kept in the database, so a restart sends nothing twice); digests daily at 07:00 UTC.
  // The same scan counts again every location status stored more than 5 minutes ago, so the overview reads stored counts.
  await boss.work(QUEUES.locationAlertScan, { pollingIntervalSeconds: Math.max(0.5, pollS) }, async () => {
    const counted = await refreshStaleLocationStatuses();
    if (counted) console.log(`[worker] collection: ${counted} location status(es) counted`);
    const r = await runLocationAlertScan();
    if (r.claimed || r.sent || r.withdrawn) console.log(`[worker] collection alerts: ${r.claimed} claimed, ${r.sent} sent, ${r.withdrawn} withdrawn (location archived or keeper left)`);
  });
  await boss.schedule(QUEUES.locationAlertScan, "*/10 * * * *", undefined, { retryLimit: 5, retryDelay: 60, retryBackoff: true });
  await boss.work(QUEUES.locationDigest, { pollingIntervalSeconds: Math.max(0.5, pollS) }, async () => {
    const r = await runLocationDigest();
    if (r.digests || r.withdrawn) console.log(`[worker] collection digests: ${r.digests} sent for ${r.alerts} alert(s), ${r.withdrawn} withdrawn`);
  });
  await boss.schedule(QUEUES.locationDigest, "0 7 * * *", undefined, { retryLimit: 5, retryDelay: 300, retryBackoff: true });
  await scanOnce().catch((e) => console.error("[worker] scan failed:", e.message));
  console.log("[worker] running");
}

async function shutdown() {
  await stopBoss().catch(() => undefined);
  await closeDb().catch(() => undefined);
  process.exit(0);
}
process.on("SIGTERM", shutdown);
process.on("SIGINT", shutdown);

main().catch((err) => {
  console.error("[worker] failed to start:", err);
  process.exit(1);
});
