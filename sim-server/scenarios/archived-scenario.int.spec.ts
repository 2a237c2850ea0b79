import { io, type Socket } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ARCHIVED_REFUSES, archivedScenarioMessage } from '../../shared/library/archived-scenario';
import type { Ack } from '../../shared/protocol/ack';
import { RUN_NAMESPACE, type ClientToServerEvents, type ServerToClientEvents } from '../../shared/protocol/run-events';
import { createTestTeam, demoScenarioDocument, readJson, startTestServer, type TestMember, type TestServer } from '../testing/test-server';

type Client = Socket<ServerToClientEvents, ClientToServerEvents>;

describe('an archived scenario is not live: runs by id, comments, hand-offs and sign-off refuse until it is restored', () => {
  let t: TestServer;
  let engineer: TestMember;
  let lead: TestMember;
  let viewer: TestMember;
  let client: Client;

  beforeAll(async () => {
    t = await startTestServer();
    const team = await createTestTeam(t, 'Archive rule');
    ({ engineer, lead, viewer } = team.members);
    client = await new Promise<Client>((resolve, reject) => {
      const c: Client = io(`${t.baseUrl}${RUN_NAMESPACE}`, { transports: ['websocket'], extraHeaders: { cookie: engineer.session.cookie }, reconnection: false });
      c.once('connect', () => resolve(c));
      c.once('connect_error', reject);
    });
  });
  afterAll(async () => {
    client.disconnect();
    await t.close();
  });

  const run = (scenarioId: number) => new Promise<Ack<unknown>>((resolve) => client.emit('run:start', { scenarioId, speed: 0 }, resolve as never));
  const comment = (id: number) => engineer.api.post(`/api/scenarios/${id}/revisions/1/comments`, { body: 'still tuned?' });
  const handOff = (id: number) => engineer.api.post(`/api/scenarios/${id}/handoffs`, { toUserId: viewer.id, access: 'view', message: 'have a look' });

  it('refuses each with 409 "archived" and words naming what to do first, and serves them again once restored', async () => {
    const id = (await readJson(await engineer.api.post('/api/scenarios', { scenario: demoScenarioDocument(), note: 'to archive' }))).id as number;
    expect((await engineer.api.post(`/api/scenarios/${id}/archive`)).status).toBe(200);

    expect(await run(id)).toEqual({ status: 'error', errors: [{ field: 'scenarioId', message: archivedScenarioMessage(ARCHIVED_REFUSES.run) }] });
    for (const [res, doing] of [
      [await comment(id), ARCHIVED_REFUSES.comment],
      [await handOff(id), ARCHIVED_REFUSES.handOff],
      [await lead.api.post(`/api/scenarios/${id}/revisions/1/sign-off`, { acknowledgeSafety: true }), ARCHIVED_REFUSES.signOff],
    ] as const) {
      expect(res.status, doing).toBe(409);
      expect((await readJson(res)).error, doing).toMatchObject({ code: 'archived', message: archivedScenarioMessage(doing) });
    }
    // Nothing was stored by the refused requests.
    expect((await readJson(await engineer.api.get(`/api/scenarios/${id}/comments`))).items).toEqual([]);
    expect((await readJson(await viewer.api.get('/api/handoffs/received'))).items).toEqual([]);
    // The detail the app reads says comments and hand-offs are off while archived.
    expect((await readJson(await engineer.api.get(`/api/scenarios/${id}`))).access).toMatchObject({ comment: false, handOff: false, archive: true });
    // The bench's own draft of the same document still runs: only the stored scenario is archived.
    const inline = await new Promise<Ack<unknown>>((resolve) => client.emit('run:start', { scenario: demoScenarioDocument() as never, speed: 0 }, resolve as never));
    expect(inline.status).toBe('ok');

    expect((await engineer.api.post(`/api/scenarios/${id}/unarchive`)).status).toBe(200);
    expect((await run(id)).status).toBe('ok');
    expect((await comment(id)).status).toBe(201);
    expect((await handOff(id)).status).toBe(201);
  });
});
