import { performance } from 'node:perf_hooks';
import { postFileStreamed } from '../testing/streamed-upload';
import { createTestTeam, demoScenarioDocument, readJson, startTestServer } from '../testing/test-server';

/**
 * One log upload measured in a process of its own (forked by log-upload-bench.ts), since peak
 * RSS only ever rises within a process: the server starts, a team and a scenario are made, then
 * the generated file is uploaded through the real route (multer, the streamed reader, the
 * store). Prints one JSON line: time, peak RSS before and after, the samples stored.
 */
const file = process.argv[2]!;
const server = await startTestServer({ DATABASE_URL: process.env['DATABASE_URL']! });
try {
  const { members } = await createTestTeam(server, `Bench logs ${process.pid}`);
  const scenario = await readJson(await members.engineer.api.post('/api/scenarios', { scenario: demoScenarioDocument() }));
  const peakBefore = process.resourceUsage().maxRSS * 1024;
  const started = performance.now();
  const res = await postFileStreamed(`${server.baseUrl}/api/scenarios/${scenario.id}/logs`, members.engineer.session, file, { name: 'bench log' });
  const ms = performance.now() - started;
  const body = JSON.parse(res.text) as { sampleCount?: number; signals?: string[] };
  process.stdout.write(
    `${JSON.stringify({ status: res.status, ms, peakBefore, peakAfter: process.resourceUsage().maxRSS * 1024, samples: body.sampleCount ?? 0, signals: (body.signals?.length ?? 0) + 1 })}\n`,
  );
} finally {
  await server.close();
}
