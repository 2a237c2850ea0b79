import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { ScenarioDetail, ScenarioSummary } from '@kinetwin/shared/protocol/api-types';
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

  /** The id comes from the address bar as text; the server answers 400 to a malformed one. */
  get(id: string): Observable<ScenarioDetail> {
    return this.http.get<ScenarioDetail>(`/api/scenarios/${encodeURIComponent(id)}`);
  }
}
