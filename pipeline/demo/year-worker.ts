/**
 * Worker thread that writes demo years ({@link runYearJob}), the entry `demo-year` of the pool
 * (pipeline/infra/worker-pool.ts) started by ./index.ts: one year per task, reporting the hours
 * written as progress.
 */
import { serveTasks } from '../infra/worker-side.ts';
import { runYearJob, type YearJob } from './year-job.ts';

serveTasks<never, YearJob, void>({
  run: (job, progress) => runYearJob(job, progress),
});
