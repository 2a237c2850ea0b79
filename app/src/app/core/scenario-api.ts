import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { ScenarioSummary } from '@kinetwin/shared/protocol/api-types';
import type { LibraryDetail } from '@kinetwin/shared/protocol/library-api';
import { type Observable, map } from 'rxjs';

interface ScenarioList {
  items: ScenarioSummary[];
}

/** The scenario library on the server. */
@Injectable({ providedIn: 'root' })
export class ScenarioApi {
  private readonly http = inject(HttpClient);

  list(): Observable<ScenarioSummary[]> {
    return this.http.get<ScenarioList>('/api/scenarios').pipe(map((body) => body.items));
  }

  /** The scenario with its newest revision, status and what the user may do. The id comes from the address bar as text; the server answers 400 to a malformed one. */
  get(id: string): Observable<LibraryDetail> {
    return this.http.get<LibraryDetail>(`/api/scenarios/${encodeURIComponent(id)}`);
  }
}
