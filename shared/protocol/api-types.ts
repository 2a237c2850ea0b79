import type { Scenario } from '../scenario/scenario-schema';
import type { FieldError } from '../validation/field-errors';

export const roles = ['viewer', 'engineer', 'lead', 'admin'] as const;
export type Role = (typeof roles)[number];

/** The signed-in user as the API reports it. */
export interface SessionUser {
  id: number;
  email: string;
  displayName: string;
  role: Role;
}

/** POST /api/auth/sign-in body. */
export interface SignInRequest {
  email: string;
  password: string;
}

/** GET /api/app-info: what the client needs before sign-in. */
export interface AppInfo {
  version: string;
  /** True only in demo/dev mode; then demoAccounts lists the seeded sign-ins. */
  demoMode: boolean;
  demoAccounts: { email: string; password: string; role: Role; displayName: string }[];
}

/** GET /api/health. */
export interface HealthReport {
  status: 'ok' | 'degraded';
  version: string;
  database: { ok: boolean; latencyMs: number | null; error?: string };
}

/** One row of GET /api/scenarios. */
export interface ScenarioSummary {
  id: number;
  name: string;
  ownerName: string;
  /** ISO 8601. */
  updatedAt: string;
}

/** GET /api/scenarios/:id. */
export interface ScenarioDetail extends ScenarioSummary {
  scenario: Scenario;
}

/** Every non-2xx JSON answer from /api. */
export interface ApiErrorBody {
  error: { code: string; message: string; fields?: FieldError[] };
}
