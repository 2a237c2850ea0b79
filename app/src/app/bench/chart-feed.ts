import type { ChartBatch } from './chart-points';

/**
 * What the angle chart draws for one run. `batches` only ever grows during a run; each new batch
 * comes with a new ChartFeed object whose `size` tells the chart how many to draw, so a signal
 * holding it changes without copying the whole log on every frame. A new run gets a new `run`
 * number and a fresh log.
 */
export interface ChartFeed {
  run: number;
  batches: readonly ChartBatch[];
  size: number;
}

/** An empty log for run number `run`. */
export function emptyChartFeed(run: number): ChartFeed {
  return { run, batches: [], size: 0 };
}

/** The feed after `batch`: appends to the same log (see ChartFeed) and skips empty batches. */
export function appendToChartFeed(feed: ChartFeed, batch: ChartBatch): ChartFeed {
  if (batch.t.length === 0) return feed;
  (feed.batches as ChartBatch[]).push(batch);
  return { run: feed.run, batches: feed.batches, size: feed.batches.length };
}

/** Concatenates batches [from, to) into one pair of arrays, for a single plot call. */
export function joinBatches(batches: readonly ChartBatch[], from: number, to: number): ChartBatch {
  const joined: ChartBatch = { t: [], angle: [] };
  for (let i = from; i < to; i++) {
    const batch = batches[i];
    for (let j = 0; j < batch.t.length; j++) {
      joined.t.push(batch.t[j]);
      joined.angle.push(batch.angle[j]);
    }
  }
  return joined;
}
