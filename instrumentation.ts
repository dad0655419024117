// Next.js start-up hook: starts the scheduled jobs with the app (Node runtime only, and only when
// CRON_ENABLED is 'true'; tests set it to 'false' and call the jobs directly).
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== 'nodejs') return;
  const { env } = await import('./lib/env');
  if (env().CRON_ENABLED !== 'true') return;
  const { startScheduler } = await import('./lib/jobs/scheduler');
  startScheduler();
}
