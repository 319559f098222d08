// Worker thread of `atlas --jobs N`: computes the fault classes it is sent, one message per chunk.
// Each class is `atlasClass` of plain data, the same call the main thread would make, so the
// document is identical for every N.
import { parentPort, workerData } from 'node:worker_threads';
import { type AtlasClassResult, type AtlasSettings } from '@hexsalvage/core';
import { atlasClass } from '@hexsalvage/core/internal';

/** A chunk of classes to compute: their indices and fault sets. */
export interface AtlasChunk {
  readonly indices: readonly number[];
  readonly classes: readonly (readonly string[])[];
}

/** What a worker sends back for a chunk. */
export type AtlasReply = { readonly indices: readonly number[]; readonly results: readonly AtlasClassResult[] } | { readonly error: string };

const settings = (workerData as { settings: AtlasSettings }).settings;
parentPort?.on('message', (chunk: AtlasChunk) => {
  let reply: AtlasReply;
  try {
    reply = { indices: chunk.indices, results: chunk.classes.map((c) => atlasClass(settings, c)) };
  } catch (e) {
    reply = { error: String((e as Error)?.message ?? e).split('\n')[0] as string };
  }
  parentPort?.postMessage(reply);
});
