import { appendToChartFeed, emptyChartFeed, joinBatches } from './chart-feed';

describe('chart feed', () => {
  it('grows with each non-empty batch and hands out a new object each time', () => {
    const empty = emptyChartFeed(3);
    const one = appendToChartFeed(empty, { t: [0, 0.1], angle: [0, 0.2] });
    const same = appendToChartFeed(one, { t: [], angle: [] });
    const two = appendToChartFeed(one, { t: [0.2], angle: [0.3] });

    expect(one).not.toBe(empty);
    expect(same).toBe(one);
    expect(two.size).toBe(2);
    expect(two.run).toBe(3);
    expect(joinBatches(two.batches, 0, two.size)).toEqual({ t: [0, 0.1, 0.2], angle: [0, 0.2, 0.3] });
  });

  it('joins only the requested range of batches', () => {
    let feed = emptyChartFeed(1);
    for (let i = 0; i < 4; i++) feed = appendToChartFeed(feed, { t: [i], angle: [10 * i] });
    expect(joinBatches(feed.batches, 1, 3)).toEqual({ t: [1, 2], angle: [10, 20] });
  });
});
