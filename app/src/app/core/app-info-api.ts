import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { AppInfo } from '@kinetwin/shared/protocol/api-types';
import type { Observable } from 'rxjs';

/** GET /api/app-info: version and, in demo mode only, the demo sign-ins. No session needed. */
@Injectable({ providedIn: 'root' })
export class AppInfoApi {
  private readonly http = inject(HttpClient);

  load(): Observable<AppInfo> {
    return this.http.get<AppInfo>('/api/app-info');
  }
}
