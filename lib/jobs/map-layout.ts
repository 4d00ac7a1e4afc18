// The map-layout job: after an analysis the worker lays the estate out once (lib/data/map-layouts.ts),
// so opening the map reads positions instead of running ELK in the browser.
import { computeMapLayouts, type MapLayoutJobData } from "@/lib/data/map-layouts";
import { QUEUES, fetchJobs, jobQueue, workQueueData } from "@/lib/data/job-queue";

async function runMapLayoutJob(data: MapLayoutJobData): Promise<void> {
  const done = await computeMapLayouts(data);
  if (done) console.log(`[map-layout] snapshot ${data.snapshotId}: ${done.views} views in ${done.ms} ms`);
}

/** The worker's loop: pg-boss hands each job over and completes it when the layouts are stored. */
export async function startMapLayouts(): Promise<void> {
  await workQueueData<MapLayoutJobData>(QUEUES.mapLayout, runMapLayoutJob);
}

/** Lay out everything queued (tests, the seed). */
export async function drainMapLayoutQueue(): Promise<number> {
  let count = 0;
  for (;;) {
    const [job] = await fetchJobs<MapLayoutJobData>(QUEUES.mapLayout);
    if (!job) return count;
    await runMapLayoutJob(job.data);
    await jobQueue().complete(QUEUES.mapLayout, job.id);
    count++;
  }
}
