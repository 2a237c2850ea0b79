import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { CheckRequest, CheckResponse } from '@kinetwin/shared/protocol/check-api';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { Observable } from 'rxjs';

/** The twin's checks, run in a worker thread on the server (POST /api/checks). */
@Injectable({ providedIn: 'root' })
export class ChecksApi {
  private readonly http = inject(HttpClient);

  /**
   * The superposition check, shift check, linear range and twin-vs-closed-form residual of a
   * draft scenario. Takes from well under a second to a minute (a sampled loop over a long
   * horizon); unsubscribing cancels the request, and the server then stops the job.
   */
  run(scenario: Scenario): Observable<CheckResponse> {
    const body: CheckRequest = { scenario };
    return this.http.post<CheckResponse>('/api/checks', body);
  }
}
