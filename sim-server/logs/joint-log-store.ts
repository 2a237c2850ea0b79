import { and, desc, eq } from 'drizzle-orm';
import { jointLogs, users } from '../../drizzle/schema';
import type { LogTable } from '../../shared/calibration/log-builder';
import type { LogReadOptions } from '../../shared/calibration/log-options';
import { MEASURED_SIGNALS, type MeasuredSignal } from '../../shared/calibration/log-signals';
import type { JointLogSummary, StoredLogReport } from '../../shared/protocol/log-api';
import type { Database } from '../db/database';
import { bytesToSamples, samplesToBytes } from './sample-bytes';

/**
 * The SQL of logged joint traces. Every read and write names the team: a log of another team is
 * never found, whatever its id. Lists never read the samples, only their count and timing.
 */

const SAMPLE_COLUMNS = {
  angle: jointLogs.angleSamples,
  velocity: jointLogs.velocitySamples,
  setpoint: jointLogs.setpointSamples,
  torque: jointLogs.torqueSamples,
} as const satisfies Record<MeasuredSignal, unknown>;

export interface NewJointLog {
  teamId: number;
  scenarioId: number;
  ownerId: number;
  name: string;
  fileName: string;
  readOptions: LogReadOptions;
  table: LogTable;
  report: StoredLogReport;
}

/** A stored log's facts without its samples. */
export interface JointLogRecord {
  id: number;
  teamId: number;
  scenarioId: number;
  ownerId: number;
  ownerName: string;
  name: string;
  fileName: string;
  readOptions: LogReadOptions;
  sampleCount: number;
  report: StoredLogReport;
  fitReport: unknown;
  createdAt: Date;
}

const recordColumns = {
  id: jointLogs.id,
  teamId: jointLogs.teamId,
  scenarioId: jointLogs.scenarioId,
  ownerId: jointLogs.ownerId,
  ownerName: users.displayName,
  name: jointLogs.name,
  fileName: jointLogs.fileName,
  readOptions: jointLogs.readOptions,
  sampleCount: jointLogs.sampleCount,
  report: jointLogs.parseReport,
  fitReport: jointLogs.fitReport,
  createdAt: jointLogs.createdAt,
};

type RecordRow = { [K in keyof typeof recordColumns]: unknown } & { id: number; teamId: number; scenarioId: number; ownerId: number; ownerName: string; name: string; fileName: string; sampleCount: number; createdAt: Date };

function toRecord(row: RecordRow): JointLogRecord {
  return { ...row, readOptions: row.readOptions as LogReadOptions, report: row.report as StoredLogReport, fitReport: row.fitReport ?? null };
}

/** The list entry of a record, as the signed-in user may act on it. */
export function summaryOf(record: JointLogRecord, userId: number): JointLogSummary {
  return {
    id: record.id,
    scenarioId: record.scenarioId,
    name: record.name,
    fileName: record.fileName,
    owner: { id: record.ownerId, displayName: record.ownerName },
    sampleCount: record.sampleCount,
    signals: record.report.columns.map((c) => c.signal).filter((s): s is MeasuredSignal => s !== 'time'),
    start: record.report.timing.start,
    end: record.report.timing.end,
    medianStep: record.report.resampled?.step ?? record.report.timing.medianStep,
    hasFit: record.fitReport !== null,
    createdAt: record.createdAt.toISOString(),
    canDelete: record.ownerId === userId,
  };
}

/** Stores a log; one row, one bytea per signal. */
export async function insertJointLog(db: Database, log: NewJointLog): Promise<JointLogRecord> {
  const [row] = await db
    .insert(jointLogs)
    .values({
      teamId: log.teamId,
      scenarioId: log.scenarioId,
      ownerId: log.ownerId,
      name: log.name,
      fileName: log.fileName,
      readOptions: log.readOptions,
      sampleCount: log.table.time.length,
      timeSamples: samplesToBytes(log.table.time),
      angleSamples: log.table.angle ? samplesToBytes(log.table.angle) : null,
      velocitySamples: log.table.velocity ? samplesToBytes(log.table.velocity) : null,
      setpointSamples: log.table.setpoint ? samplesToBytes(log.table.setpoint) : null,
      torqueSamples: log.table.torque ? samplesToBytes(log.table.torque) : null,
      parseReport: log.report,
    })
    .returning({ id: jointLogs.id });
  const stored = await loadJointLog(db, log.teamId, row!.id);
  if (!stored) throw new Error(`joint log ${row!.id} vanished right after it was stored`);
  return stored;
}

/** A scenario's logs, newest first (the caller has checked the scenario is the team's). */
export async function listJointLogs(db: Database, teamId: number, scenarioId: number): Promise<JointLogRecord[]> {
  const rows = await db
    .select(recordColumns)
    .from(jointLogs)
    .innerJoin(users, eq(users.id, jointLogs.ownerId))
    .where(and(eq(jointLogs.teamId, teamId), eq(jointLogs.scenarioId, scenarioId)))
    .orderBy(desc(jointLogs.createdAt), desc(jointLogs.id));
  return rows.map(toRecord);
}

/** One log of the team, without samples, or null. */
export async function loadJointLog(db: Database, teamId: number, logId: number): Promise<JointLogRecord | null> {
  const [row] = await db
    .select(recordColumns)
    .from(jointLogs)
    .innerJoin(users, eq(users.id, jointLogs.ownerId))
    .where(and(eq(jointLogs.id, logId), eq(jointLogs.teamId, teamId)));
  return row ? toRecord(row) : null;
}

/** One log's samples in SI, or null when the team has no such log. */
export async function loadJointLogTable(db: Database, teamId: number, logId: number): Promise<LogTable | null> {
  const [row] = await db
    .select({ time: jointLogs.timeSamples, ...SAMPLE_COLUMNS })
    .from(jointLogs)
    .where(and(eq(jointLogs.id, logId), eq(jointLogs.teamId, teamId)));
  if (!row) return null;
  const time = bytesToSamples(row.time);
  // The table's check constraint makes every length 8 × sample_count; a mismatch here is corruption.
  if (!time) throw new Error(`joint log ${logId}: time samples are not whole Float64s`);
  const table: LogTable = { time };
  for (const signal of MEASURED_SIGNALS) {
    const bytes = row[signal];
    if (bytes === null) continue;
    const values = bytesToSamples(bytes);
    if (!values || values.length !== time.length) throw new Error(`joint log ${logId}: ${signal} samples do not match time`);
    table[signal] = values;
  }
  return table;
}

/** Deletes one log of the team; false when there was none. */
export async function deleteJointLog(db: Database, teamId: number, logId: number): Promise<boolean> {
  const deleted = await db
    .delete(jointLogs)
    .where(and(eq(jointLogs.id, logId), eq(jointLogs.teamId, teamId)))
    .returning({ id: jointLogs.id });
  return deleted.length > 0;
}

/** Stores the newest fit's report on a log of the team; false when there was none. */
export async function saveFitReport(db: Database, teamId: number, logId: number, fitReport: unknown): Promise<boolean> {
  const updated = await db
    .update(jointLogs)
    .set({ fitReport })
    .where(and(eq(jointLogs.id, logId), eq(jointLogs.teamId, teamId)))
    .returning({ id: jointLogs.id });
  return updated.length > 0;
}
