// The job queue for long runs on PostgreSQL (issue 14): pg-boss 10.4.2 (the last line that runs on Node 20),
// kept in the same database under the schema `pgboss`. Any app instance may pick a job up; a job whose
// instance died stays `active` until it expires, and pg-boss's supervisor then puts it back for another
// attempt, so a run survives an instance restart. SQLite installations never load this module.
import PgBoss from "pg-boss";
import { databaseUrl } from "./env";
import { pgConnection } from "./pgAdapter";

const globalForQueue = globalThis as unknown as { corelagQueue?: Promise<PgBoss>; corelagQueues?: Set<string> };

/** Seconds a started job may stay active before it counts as abandoned (its instance died) and is retried. */
export function jobExpirySeconds(): number {
  const s = Number(process.env.CORELAG_JOB_EXPIRE_S ?? "");
  return Number.isFinite(s) && s >= 5 ? s : 600;
}

/** How often this instance's supervisor looks for abandoned jobs. */
function maintenanceSeconds(): number {
  return Math.max(5, Math.min(120, Math.round(jobExpirySeconds() / 4)));
}

/** The started queue of this process (started on first use); each queue named is created once per process. */
export async function jobQueue(queues: readonly string[]): Promise<PgBoss> {
  globalForQueue.corelagQueue ??= (async () => {
    const boss = new PgBoss({ ...pgConnection(databaseUrl()), schema: "pgboss", max: 4, application_name: "corelag-jobs", maintenanceIntervalSeconds: maintenanceSeconds(), monitorStateIntervalSeconds: 60 } as PgBoss.ConstructorOptions);
    boss.on("error", (e: Error) => console.error(`corelag: job queue: ${e.message}`));
    await boss.start();
    globalForQueue.corelagQueues = new Set();
    return boss;
  })().catch((e: unknown) => {
    globalForQueue.corelagQueue = undefined;
    throw e;
  });
  const boss = await globalForQueue.corelagQueue;
  const created = (globalForQueue.corelagQueues ??= new Set());
  for (const q of queues) {
    if (created.has(q)) continue;
    await boss.createQueue(q); // creating an existing queue is a no-op in pg-boss 10
    created.add(q);
  }
  return boss;
}

export type JobState = PgBoss.JobWithMetadata["state"];

export interface QueuedJob<T> {
  id: string;
  state: JobState;
  data: T;
  output: unknown;
  createdOn: Date;
  completedOn: Date | null;
}

export async function enqueueJob(queue: string, data: object, retryLimit = 3): Promise<string> {
  const boss = await jobQueue([queue]);
  const id = await boss.send(queue, data, { retryLimit, retryDelay: 1, expireInSeconds: jobExpirySeconds() });
  if (!id) throw new Error(`the job queue refused a ${queue} job`);
  return id;
}

export async function getJob<T>(queue: string, id: string): Promise<QueuedJob<T> | null> {
  if (!/^[0-9a-f-]{36}$/i.test(id)) return null;
  const boss = await jobQueue([queue]);
  const j = await boss.getJobById<T>(queue, id, { includeArchive: true });
  return j ? { id: j.id, state: j.state, data: j.data, output: j.output, createdOn: j.createdOn, completedOn: j.completedOn } : null;
}

export async function cancelJob(queue: string, id: string): Promise<void> {
  const boss = await jobQueue([queue]);
  await boss.cancel(queue, id);
}

/** `workers` loops in this process, each taking one job at a time; the handler's return value is the job's output. */
export async function workJobs<T>(queue: string, workers: number, handler: (job: { id: string; data: T }) => Promise<object>): Promise<void> {
  const boss = await jobQueue([queue]);
  for (let i = 0; i < workers; i++) {
    await boss.work<T>(queue, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async ([job]) => handler({ id: job!.id, data: job!.data }));
  }
}

/** Stops this process's queue: running jobs stay with the database and are retried after they expire. */
export async function stopJobQueue(): Promise<void> {
  const q = globalForQueue.corelagQueue;
  globalForQueue.corelagQueue = undefined;
  if (q) await (await q).stop({ graceful: false, wait: true });
}
