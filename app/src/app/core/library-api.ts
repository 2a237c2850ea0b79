import { HttpClient, HttpParams, type HttpResponse } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type {
  ActivityPage,
  Comment,
  CommentCreateRequest,
  CommentThreadList,
  Handoff,
  HandoffCreateRequest,
  HandoffList,
  LibraryDetail,
  LibraryPage,
  LibraryQuery,
  RevisionDetail,
  RevisionDiff,
  RevisionList,
  RevisionRestoreRequest,
  RevisionSummary,
  ScenarioCreateRequest,
  ScenarioDuplicateRequest,
  ScenarioImportRequest,
  ScenarioPatchRequest,
  ScenarioSaveRequest,
  SignOffRequest,
} from '@kinetwin/shared/protocol/library-api';
import { type Observable, map } from 'rxjs';

/** Answer of POST /api/scenarios/:id/revisions/:n/sign-off. */
export interface SignOffResponse {
  revision: RevisionDetail;
  safetyCaution: string;
}

/** A scenario file as exported: its text, suggested file name and the caution header. */
export interface ExportedScenario {
  text: string;
  fileName: string;
  safetyCaution: string | null;
}

/** Ids travel as numbers; a scenario id from the address bar is checked by the server (400 if malformed). */
function scenarioPath(id: number | string): string {
  return `/api/scenarios/${encodeURIComponent(String(id))}`;
}

/** The query without empty fields: the server refuses unknown and repeated parameters. */
function libraryParams(query: LibraryQuery): HttpParams {
  let params = new HttpParams();
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined || value === null || value === '') continue;
    params = params.set(key, String(value));
  }
  return params;
}

/** The team library on the server: scenarios and their revisions, hand-offs, comments, sign-off, activity. */
@Injectable({ providedIn: 'root' })
export class LibraryApi {
  private readonly http = inject(HttpClient);

  list(query: LibraryQuery): Observable<LibraryPage> {
    return this.http.get<LibraryPage>('/api/scenarios', { params: libraryParams(query) });
  }

  get(id: number | string): Observable<LibraryDetail> {
    return this.http.get<LibraryDetail>(scenarioPath(id));
  }

  create(request: ScenarioCreateRequest): Observable<LibraryDetail> {
    return this.http.post<LibraryDetail>('/api/scenarios', request);
  }

  importFile(request: ScenarioImportRequest): Observable<LibraryDetail> {
    return this.http.post<LibraryDetail>('/api/scenarios/import', request);
  }

  /** A new revision on top of baseRevision; a 409 carries a StaleSaveBody. */
  save(id: number, request: ScenarioSaveRequest): Observable<LibraryDetail> {
    return this.http.put<LibraryDetail>(scenarioPath(id), request);
  }

  patch(id: number, request: ScenarioPatchRequest): Observable<LibraryDetail> {
    return this.http.patch<LibraryDetail>(scenarioPath(id), request);
  }

  duplicate(id: number, request: ScenarioDuplicateRequest): Observable<LibraryDetail> {
    return this.http.post<LibraryDetail>(`${scenarioPath(id)}/duplicate`, request);
  }

  setArchived(id: number, archived: boolean): Observable<LibraryDetail> {
    return this.http.post<LibraryDetail>(`${scenarioPath(id)}/${archived ? 'archive' : 'unarchive'}`, {});
  }

  exportFile(id: number, revision?: number): Observable<ExportedScenario> {
    const params = revision === undefined ? undefined : new HttpParams().set('revision', revision);
    return this.http.get(`${scenarioPath(id)}/export`, { params, observe: 'response', responseType: 'text' }).pipe(
      map((response: HttpResponse<string>) => ({
        text: response.body ?? '',
        fileName: /filename="([^"]+)"/.exec(response.headers.get('content-disposition') ?? '')?.[1] ?? `scenario-${id}.json`,
        safetyCaution: response.headers.get('x-kinetwin-safety-caution'),
      })),
    );
  }

  revisions(id: number | string): Observable<RevisionSummary[]> {
    return this.http.get<RevisionList>(`${scenarioPath(id)}/revisions`).pipe(map((body) => body.items));
  }

  revision(id: number, n: number): Observable<RevisionDetail> {
    return this.http.get<RevisionDetail>(`${scenarioPath(id)}/revisions/${n}`);
  }

  diff(id: number, from: number, to: number): Observable<RevisionDiff> {
    return this.http.get<RevisionDiff>(`${scenarioPath(id)}/diff`, { params: new HttpParams().set('from', from).set('to', to) });
  }

  restore(id: number, n: number, request: RevisionRestoreRequest): Observable<LibraryDetail> {
    return this.http.post<LibraryDetail>(`${scenarioPath(id)}/revisions/${n}/restore`, request);
  }

  signOff(id: number, n: number, request: SignOffRequest): Observable<SignOffResponse> {
    return this.http.post<SignOffResponse>(`${scenarioPath(id)}/revisions/${n}/sign-off`, request);
  }

  comments(id: number, revision: number): Observable<Comment[]> {
    return this.http.get<CommentThreadList>(`${scenarioPath(id)}/comments`, { params: new HttpParams().set('revision', revision) }).pipe(map((body) => body.items));
  }

  postComment(id: number, revision: number, request: CommentCreateRequest): Observable<Comment> {
    return this.http.post<Comment>(`${scenarioPath(id)}/revisions/${revision}/comments`, request);
  }

  handOff(id: number, request: HandoffCreateRequest): Observable<Handoff> {
    return this.http.post<Handoff>(`${scenarioPath(id)}/handoffs`, request);
  }

  handedToMe(): Observable<Handoff[]> {
    return this.http.get<HandoffList>('/api/handoffs/received').pipe(map((body) => body.items));
  }

  handedByMe(): Observable<Handoff[]> {
    return this.http.get<HandoffList>('/api/handoffs/sent').pipe(map((body) => body.items));
  }

  activity(id: number, page: number, pageSize: number): Observable<ActivityPage> {
    return this.http.get<ActivityPage>(`${scenarioPath(id)}/activity`, { params: new HttpParams().set('page', page).set('pageSize', pageSize) });
  }

  teamActivity(page: number, pageSize: number): Observable<ActivityPage> {
    return this.http.get<ActivityPage>('/api/team/activity', { params: new HttpParams().set('page', page).set('pageSize', pageSize) });
  }
}
