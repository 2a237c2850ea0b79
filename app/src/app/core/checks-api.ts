import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { CheckRequest, CheckResponse, OperatingRangeRequest, OperatingRangeResponse, SineSweepRequest, SineSweepResponse } from '@kinetwin/shared/protocol/check-api';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { Observable } from 'rxjs';

/**
 * The twin's batch work, run in a worker thread on the server: the checks (POST /api/checks),
 * the measured sine sweep and the operating range. Each takes from well under a second to a
 * minute; unsubscribing cancels the request, and the server then stops the job.
 */
@Injectable({ providedIn: 'root' })
export class ChecksApi {
  private readonly http = inject(HttpClient);

  /** The superposition check, shift check, linear range and twin-vs-closed-form residual of a draft scenario. */
  run(scenario: Scenario): Observable<CheckResponse> {
    const body: CheckRequest = { scenario };
    return this.http.post<CheckResponse>('/api/checks', body);
  }

  /** The twin's own frequency response, one injected sine per frequency. */
  sineSweep(body: SineSweepRequest): Observable<SineSweepResponse> {
    return this.http.post<SineSweepResponse>('/api/checks/sine-sweep', body);
  }

  /** The linear model about an operating angle and the largest move it describes. */
  operatingRange(body: OperatingRangeRequest): Observable<OperatingRangeResponse> {
    return this.http.post<OperatingRangeResponse>('/api/checks/operating-range', body);
  }
}
