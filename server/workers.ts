import type { JobQueue } from './lib/jobs';
import type { Services } from './services';
import { ALERT_CHECK_QUEUE } from './components/alerts/service';
import { PARTITION_QUEUE, ensureInspectionPartitions } from './components/inspections/partitions';
import { OUTBOX_QUEUE } from './components/mail/service';
import { TRIAL_QUEUE, TRIAL_RESUME_QUEUE } from './components/trials/service';

/** Registers the background job handlers of this process. */
export async function startWorkers(jobs: JobQueue, services: Services): Promise<void> {
  await jobs.work<{ trialId: string }>(TRIAL_QUEUE, ({ trialId }) => services.trials.run(trialId));
  // A flush that leaves mail waiting fails, so the queue tries again later with backoff.
  await jobs.work(OUTBOX_QUEUE, async () => {
    const { waiting } = await services.mail.flush();
    if (waiting > 0) throw new Error(`${waiting} e-mail(s) still waiting for the mail server`);
  });
  // The alert check runs in the background every few minutes, once per period however many workers there are.
  await jobs.work(ALERT_CHECK_QUEUE, async () => {
    await services.alerts.check();
  });
  await jobs.repeat(ALERT_CHECK_QUEUE, services.alerts.checkEveryMinutes);
  // Trials whose worker stopped mid-way (killed, machine lost) go back on the queue: checked every
  // minute by one worker, and at once when a worker starts (it may be the replacement).
  await jobs.work(TRIAL_RESUME_QUEUE, async () => {
    await services.trials.resumeAbandoned();
  });
  await jobs.repeat(TRIAL_RESUME_QUEUE, 1);
  await services.trials.resumeAbandoned();
  // Inspections' monthly partitions, made ahead (this month and the next two): checked at start and every
  // 12 hours (the longest period the queue keeps a job for). A busy table may make the check give way
  // (lock timeout); the next run tries again.
  await jobs.work(PARTITION_QUEUE, async () => {
    await ensureInspectionPartitions(services.dataSource);
  });
  await jobs.repeat(PARTITION_QUEUE, 12 * 60);
  await ensureInspectionPartitions(services.dataSource).catch((err: Error) => process.stderr.write(`inspection partitions: ${err.message}\n`));
  // Mail left from before a restart.
  await services.mail.kick();
}
