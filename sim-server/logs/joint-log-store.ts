import { and, desc, eq } from 'drizzle-orm';
import { jointLogSignals, jointLogs, users } from '../../drizzle/schema';
import type { LogTable } from '../../shared/calibration/log-builder';
import type { LogReadOptions } from '../../shared/calibration/log-options';
import { LOG_SIGNALS, type LogSignal, type MeasuredSignal } from '../../shared/calibration/log-signals';
import type { JointLogSummary, StoredLogReport } from '../../shared/protocol/log-api';
import type { Database } from '../db/database';
import { bytesToSamples, samplesToBytes } from './sample-bytes';

/**
 * The SQL of logged joint traces. Every read and write names the team: a log of another team is
 * never found, whatever its id. Lists never read the samples, only their count and timing.
 * Samples go in and out one signal per statement: node-postgres copies a statement's parameters
 * into its message more than once, so a statement carrying all signals at once would briefly
 * hold several times the log's samples.
 */

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

/** Stores a log: its row, then one row per signal, in one transaction. */
export async function insertJointLog(db: Database, log: NewJointLog): Promise<JointLogRecord> {
  const id = await db.transaction(async (tx) => {
    const [row] = await tx
      .insert(jointLogs)
      .values({
        teamId: log.teamId,
        scenarioId: log.scenarioId,
        ownerId: log.ownerId,
        name: log.name,
        fileName: log.fileName,
        readOptions: log.readOptions,
        sampleCount: log.table.time.length,
        parseReport: log.report,
      })
      .returning({ id: jointLogs.id });
    for (const signal of LOG_SIGNALS) {
      const values = log.table[signal];
      if (!values) continue;
      if (values.length !== log.table.time.length) throw new Error(`joint log: ${signal} has ${values.length} samples, time has ${log.table.time.length}`);
      await tx.insert(jointLogSignals).values({ logId: row!.id, signal, samples: samplesToBytes(values) });
    }
    return row!.id;
  });
  const stored = await loadJointLog(db, log.teamId, id);
  if (!stored) throw new Error(`joint log ${id} vanished right after it was stored`);
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

/** One log's samples in SI, or null when the team has no such log. Read a signal at a time, like the writes. */
export async function loadJointLogTable(db: Database, teamId: number, logId: number): Promise<LogTable | null> {
  const [log] = await db
    .select({ sampleCount: jointLogs.sampleCount })
    .from(jointLogs)
    .where(and(eq(jointLogs.id, logId), eq(jointLogs.teamId, teamId)));
  if (!log) return null;
  const stored = await db.select({ signal: jointLogSignals.signal }).from(jointLogSignals).where(eq(jointLogSignals.logId, logId));
  const signals = new Set(stored.map((s) => s.signal));
  const read = async (signal: LogSignal): Promise<Float64Array> => {
    const [row] = await db
      .select({ samples: jointLogSignals.samples })
      .from(jointLogSignals)
      .where(and(eq(jointLogSignals.logId, logId), eq(jointLogSignals.signal, signal)));
    const values = row ? bytesToSamples(row.samples) : null;
    // Written in one transaction with sample_count; a mismatch here is corruption, not input.
    if (!values || values.length !== log.sampleCount) throw new Error(`joint log ${logId}: ${signal} does not hold ${log.sampleCount} samples`);
    return values;
  };
  const table: LogTable = { time: await read('time') };
  for (const signal of LOG_SIGNALS) {
    if (signal === 'time' || !signals.has(signal)) continue;
    table[signal as MeasuredSignal] = await read(signal);
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
