/** A worker thread of `gainwright report DIR --json` (src/cli/batch.ts): reports its share of the files. */
import { parentPort, workerData } from 'node:worker_threads';
import { folderLine, type BatchJob, type BatchResult } from './batch.js';

const job = workerData as BatchJob;
job.files.forEach((file, k) => {
  const message: BatchResult = { index: job.indices[k]!, ...folderLine(job.dir, file, job.spreadTrials, job.kit) };
  parentPort!.postMessage(message);
});
