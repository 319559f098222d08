import { Worker } from 'node:worker_threads';
import { type AtlasClassResult, type AtlasProgress, type AtlasWork } from '@hexsalvage/core';
import { atlasClass } from '@hexsalvage/core/internal';
import type { AtlasChunk, AtlasReply } from './atlasWorker.js';

/**
 * Computes an atlas's fault classes on `jobs` worker threads (`node:worker_threads`), or on this
 * thread when `jobs` is 1 or there is a single class. Classes go out in chunks from one queue, so a
 * slow class does not hold up the rest; results are put back by class index, so the order and the
 * numbers do not depend on `jobs`.
 *
 * @param work - from `atlasWork`
 * @param jobs - number of threads (≥ 1)
 * @param onProgress - called as classes complete
 * @returns one result per class, in class order
 * @example
 * ```ts
 * const results = await computeClasses(atlasWork({ topology: 'npc' }), 2);
 * ```
 */
export async function computeClasses(work: AtlasWork, jobs: number, onProgress?: AtlasProgress): Promise<AtlasClassResult[]> {
  const total = work.classes.length;
  if (jobs <= 1 || total <= 1) {
    return work.classes.map((c, k) => {
      const r = atlasClass(work.settings, c);
      onProgress?.(k + 1, total);
      return r;
    });
  }
  const threads = Math.min(jobs, total);
  // small chunks for balance, large enough that messaging stays cheap
  const size = Math.max(1, Math.min(16, Math.ceil(total / (threads * 6))));
  const results: (AtlasClassResult | undefined)[] = new Array(total);
  let next = 0;
  let done = 0;
  const workers = Array.from({ length: threads }, () => new Worker(new URL('./atlasWorker.js', import.meta.url), { workerData: { settings: work.settings } }));
  try {
    await new Promise<void>((resolve, reject) => {
      const send = (w: Worker): boolean => {
        if (next >= total) return false;
        const indices = Array.from({ length: Math.min(size, total - next) }, (_, i) => next + i);
        next += indices.length;
        const chunk: AtlasChunk = { indices, classes: indices.map((i) => work.classes[i] as readonly string[]) };
        w.postMessage(chunk);
        return true;
      };
      let busy = 0;
      for (const w of workers) {
        w.on('message', (reply: AtlasReply) => {
          if ('error' in reply) {
            reject(new Error(reply.error));
            return;
          }
          reply.indices.forEach((i, k) => {
            results[i] = reply.results[k];
          });
          done += reply.indices.length;
          onProgress?.(done, total);
          busy--;
          if (send(w)) busy++;
          else if (busy === 0) resolve();
        });
        w.on('error', reject);
        w.on('exit', (code) => {
          if (done < total) reject(new Error(`an atlas worker stopped (exit code ${code})`));
        });
        if (send(w)) busy++;
      }
    });
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
  return results as AtlasClassResult[];
}
