import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import type { Comment, TeamMember } from '@kinetwin/shared/protocol/library-api';
import { CommentThread } from './comment-thread';

const members: TeamMember[] = [
  { id: 1, email: 'rhea@lab.test', displayName: 'Rhea', role: 'engineer', joinedAt: '' },
  { id: 2, email: 'tomas@lab.test', displayName: 'Tomás', role: 'lead', joinedAt: '' },
];
const reply: Comment = { id: 8, revision: 3, parentId: 7, author: { id: 1, displayName: 'Rhea' }, body: 'Done.', mentions: [], createdAt: '2026-12-01T10:05:00.000Z', replies: [] };
const top: Comment = {
  id: 7,
  revision: 3,
  parentId: null,
  author: { id: 2, displayName: 'Tomás' },
  body: '@rhea@lab.test can you drop kd? cc @someone@outside.test',
  mentions: [{ id: 1, displayName: 'Rhea' }],
  createdAt: '2026-12-01T10:00:00.000Z',
  replies: [reply],
};

describe('CommentThread', () => {
  let fixture: ComponentFixture<CommentThread>;
  let http: HttpTestingController;
  let root: HTMLElement;

  async function settle(): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
  }

  async function open(canComment: boolean): Promise<void> {
    fixture.componentRef.setInput('scenarioId', 9);
    fixture.componentRef.setInput('revision', 3);
    fixture.componentRef.setInput('comments', [top]);
    fixture.componentRef.setInput('members', members);
    fixture.componentRef.setInput('canComment', canComment);
    await settle();
  }

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CommentThread);
    root = fixture.nativeElement;
  });

  afterEach(() => http.verify());

  it('highlights only mentions the server resolved to teammates and nests replies under their parent', async () => {
    await open(true);
    const marks = [...root.querySelectorAll('[data-test=mention]')].map((mark) => mark.textContent);
    expect(marks).toEqual(['@rhea@lab.test']);
    expect(root.querySelector('[data-test=comment-text]')?.textContent).toContain('cc @someone@outside.test');
    const nested = root.querySelector('[data-test=comment] [data-test=comment] [data-test=comment-text]');
    expect(nested?.textContent?.trim()).toBe('Done.');
  });

  it('posts a reply with its parent id', async () => {
    await open(true);
    root.querySelector<HTMLButtonElement>('[data-test=reply]')!.click();
    await settle();
    const body = root.querySelector<HTMLTextAreaElement>('[data-test=reply-body]')!;
    body.value = 'Will do @tomas@lab.test';
    body.dispatchEvent(new Event('input'));
    await settle();
    root.querySelector<HTMLButtonElement>('[data-test=post-reply]')!.click();
    const request = http.expectOne('/api/scenarios/9/revisions/3/comments');
    expect(request.request.body).toEqual({ body: 'Will do @tomas@lab.test', parentId: 7 });
    request.flush({ ...reply, id: 9, body: 'Will do @tomas@lab.test' });
  });

  it('gives a reader no way to write', async () => {
    await open(false);
    expect(root.querySelector('[data-test=comment-body]')).toBeNull();
    expect(root.querySelector('[data-test=post-comment]')).toBeNull();
    expect(root.querySelector('[data-test=reply]')).toBeNull();
  });
});
