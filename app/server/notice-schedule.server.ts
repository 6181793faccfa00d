/**
 * The schedule that sends notices: every few minutes, one `runDueNotices`
 * tick. Every app instance may run it; the claim in `notices` keeps each
 * e-mail to one sending. Started by the server entry (server/app.ts through
 * server.js), never by the tests unless a test starts it.
 */
import { Cron } from "croner";
import { db } from "~/db/client.server";
import { runDueNotices } from "~/models/notices.server";

/** NOTICE_SCHEDULE: a cron pattern (UTC), "off" to send no scheduled notices from this instance. Every 5 minutes by default. */
export function noticeSchedulePattern(env: NodeJS.ProcessEnv = process.env) {
  const value = env.NOTICE_SCHEDULE?.trim();
  if (value === "off") return null;
  return value || "*/5 * * * *";
}

export function startNoticeSchedule(pattern = noticeSchedulePattern()) {
  if (!pattern) return null;
  return new Cron(pattern, { name: "notices", timezone: "UTC", protect: true, unref: true, catch: (error) => console.error("Scheduled notices failed; the next run tries again.", error) }, async () => {
    await runDueNotices(db, new Date());
  });
}
