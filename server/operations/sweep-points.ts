// Sweep points: written in batches by one statement each, read back for tables and analysis.
import pg from 'pg';
import type { Sequelize, Transaction } from 'sequelize';
import { QueryTypes } from 'sequelize';
import type { SweepReading } from '../../shared/engine';
import type { SweepMode } from '../../shared/schemas/sweeps';

export interface PointRow {
  sequence: number;
  frequencyHz: number;
  vinV: number;
  voutV: number;
  phaseDeg: number | null;
  floorV: number | null;
  sourceLine: number | null;
}

/**
 * A PostgreSQL array literal of numbers, `{1,2.5,NULL}`. Built here rather than by pg, whose generic
 * array serialisation prepares, quotes and escapes every element: with 20 streams at once that was
 * the largest single cost on the server. `String(number)` is the shortest round-trip form, which
 * PostgreSQL reads back to the same double.
 */
function numberArrayLiteral(count: number, valueAt: (index: number) => number | null): string {
  let literal = '{';
  for (let index = 0; index < count; index++) {
    const value = valueAt(index);
    literal += (index === 0 ? '' : ',') + (value === null ? 'NULL' : String(value));
  }
  return `${literal}}`;
}

/**
 * Inserts points in one statement (unnest of column arrays). Points already stored for the same
 * (sweep, sequence) are left as they were, so a resent batch is stored exactly once.
 * Returns how many rows were new.
 */
export async function insertPoints(sequelize: Sequelize, sweepId: string, points: readonly PointRow[], transaction?: Transaction): Promise<number> {
  if (points.length === 0) return 0;
  const column = (valueAt: (point: PointRow) => number | null) => numberArrayLiteral(points.length, (index) => valueAt(points[index]));
  const [, inserted] = (await sequelize.query(
    `INSERT INTO sweep_points (sweep_id, sequence, frequency_hz, vin_v, vout_v, phase_deg, floor_v, source_line)
     SELECT $1, * FROM unnest($2::int[], $3::float8[], $4::float8[], $5::float8[], $6::float8[], $7::float8[], $8::int[])
     ON CONFLICT (sweep_id, sequence) DO NOTHING`,
    {
      bind: [
        sweepId,
        column((point) => point.sequence),
        column((point) => point.frequencyHz),
        column((point) => point.vinV),
        column((point) => point.voutV),
        column((point) => point.phaseDeg),
        column((point) => point.floorV),
        column((point) => point.sourceLine),
      ],
      transaction,
      type: QueryTypes.INSERT,
    },
  )) as unknown as [unknown, number];
  return inserted;
}

/**
 * The highest sequence number n such that every point 1…n of the sweep is stored: what the
 * stream may acknowledge. 0 when point 1 is missing.
 */
export async function contiguousThrough(sequelize: Sequelize, sweepId: string): Promise<number> {
  const [row] = (await sequelize.query(
    `SELECT count(*)::int AS count, coalesce(max(sequence), 0)::int AS highest FROM sweep_points WHERE sweep_id = $1`,
    { bind: [sweepId], type: QueryTypes.SELECT },
  )) as { count: number; highest: number }[];
  if (row.count === row.highest) return row.highest;
  const [gap] = (await sequelize.query(
    `SELECT coalesce(min(previous), 0)::int AS through FROM (
       SELECT sequence, lag(sequence, 1, 0) OVER (ORDER BY sequence) AS previous FROM sweep_points WHERE sweep_id = $1
     ) steps WHERE sequence <> previous + 1`,
    { bind: [sweepId], type: QueryTypes.SELECT },
  )) as { through: number }[];
  return gap.through;
}

type ReadingRow = [mode: SweepMode, sequence: number, frequencyHz: number, vinV: number, voutV: number, phaseDeg: number | null, floorV: number | null];

/**
 * Every point of a session's sweeps that are not deleted, by mode, as the engine's readings (line =
 * the point's sequence), by frequency, then sweep creation, then sequence. For a session of 200,000
 * points, Sequelize's row objects took longer than the query itself: the rows come through the pg
 * pool as arrays, one at a time, so each is garbage as soon as its reading is made.
 */
export async function sessionReadings(pool: pg.Pool, sessionId: string): Promise<Record<SweepMode, SweepReading[]>> {
  const readings: Record<SweepMode, SweepReading[]> = { differential: [], 'common-mode': [] };
  const config: pg.QueryArrayConfig = {
    text: `SELECT s.mode, p.sequence, p.frequency_hz, p.vin_v, p.vout_v, p.phase_deg, p.floor_v
             FROM sweep_points p JOIN sweeps s ON s.id = p.sweep_id
            WHERE s.bench_session_id = $1 AND s.deleted_at IS NULL
            ORDER BY p.frequency_hz, s.created_at, p.sequence`,
    values: [sessionId],
    rowMode: 'array',
  };
  const client = await pool.connect();
  try {
    await new Promise<void>((resolve, reject) => {
      const query = client.query(new pg.Query<ReadingRow>(config));
      query.on('row', ([mode, line, frequencyHz, vinVolts, voutVolts, phaseDeg, floorVolts]) => {
        readings[mode].push({ line, frequencyHz, vinVolts, voutVolts, phaseDeg, floorVolts });
      });
      query.on('end', () => resolve());
      query.on('error', reject);
    });
    client.release();
  } catch (error) {
    // As pool.query does: a client whose query failed is closed, not reused.
    client.release(error as Error);
    throw error;
  }
  return readings;
}

/** Point counts and frequency range per sweep. */
export async function sweepPointStats(sequelize: Sequelize, sweepIds: string[]): Promise<Map<string, { count: number; minimumHz: number | null; maximumHz: number | null }>> {
  if (sweepIds.length === 0) return new Map();
  const rows = (await sequelize.query(
    `SELECT sweep_id AS "sweepId", count(*)::int AS count, min(frequency_hz) AS "minimumHz", max(frequency_hz) AS "maximumHz"
       FROM sweep_points WHERE sweep_id = ANY($1::text[]) GROUP BY sweep_id`,
    { bind: [sweepIds], type: QueryTypes.SELECT },
  )) as { sweepId: string; count: number; minimumHz: number; maximumHz: number }[];
  return new Map(rows.map((row) => [row.sweepId, { count: row.count, minimumHz: row.minimumHz, maximumHz: row.maximumHz }]));
}

const sortColumns = { sequence: 'sequence', frequencyHz: 'frequency_hz', vinV: 'vin_v', voutV: 'vout_v', gain: 'vout_v / vin_v' } as const;

/** One page of a sweep's points, sorted on the server. */
export async function pagePoints(
  sequelize: Sequelize,
  sweepId: string,
  query: { page: number; pageSize: number; sort: keyof typeof sortColumns; direction: 'asc' | 'desc' },
): Promise<{ rows: PointRow[]; total: number }> {
  const order = `${sortColumns[query.sort]} ${query.direction === 'desc' ? 'DESC' : 'ASC'}, sequence ASC`;
  const rows = (await sequelize.query(
    `SELECT sequence, frequency_hz AS "frequencyHz", vin_v AS "vinV", vout_v AS "voutV", phase_deg AS "phaseDeg", floor_v AS "floorV", source_line AS "sourceLine"
       FROM sweep_points WHERE sweep_id = $1 ORDER BY ${order} LIMIT $2 OFFSET $3`,
    { bind: [sweepId, query.pageSize, (query.page - 1) * query.pageSize], type: QueryTypes.SELECT },
  )) as PointRow[];
  const [{ total }] = (await sequelize.query(`SELECT count(*)::int AS total FROM sweep_points WHERE sweep_id = $1`, {
    bind: [sweepId],
    type: QueryTypes.SELECT,
  })) as { total: number }[];
  return { rows, total };
}
