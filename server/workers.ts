import type { JobQueue } from './lib/jobs';
import type { Services } from './services';
import { TRIAL_QUEUE } from './components/trials/service';

/** Registers the background job handlers of this process. */
export async function startWorkers(jobs: JobQueue, services: Services): Promise<void> {
  await jobs.work<{ trialId: string }>(TRIAL_QUEUE, ({ trialId }) => services.trials.run(trialId));
}
