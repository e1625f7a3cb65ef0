// Uploads into a bench session: a sweep table (any header, mapped to columns and units) or a
// batch of two-channel captures fitted by the engine. Each upload is all or nothing.
import type { Request, Response } from 'express';
import multer, { MulterError, type StorageEngine } from 'multer';
import { z } from 'zod';
import {
  createSweepAccumulator,
  createSweepBuilder,
  EngineInputError,
  fitCapture,
  parseCaptureFile,
} from '../../shared/engine';
import { engineColumnMapping } from '../../shared/sweep-mapping';
import { canonicalMapping, captureTagsSchema, uploadSweepFieldsSchema, type SweepMode } from '../../shared/schemas/sweeps';
import type { AppContext } from '../app-context';
import { badRequest, conflict, fieldsFromZod, HttpError, notFound } from '../http/errors';
import { BenchSession, Sweep, User, UserPreference } from '../models';
import { addCompleteSweeps, pointRowsFromSweep } from '../operations/bench-sessions';
import { sweepPointStats, type PointRow } from '../operations/sweep-points';
import { presentSweep } from '../presenters/bench-session';
import { readDelimitedRows, type DelimitedRows } from './delimited-rows';

/** Limits that are not configuration (file sizes are: ServerConfig.uploads). */
export const uploadLimits = {
  sweepRows: 500_000,
  captureFiles: 200,
} as const;

export const columnMappingPreferenceKey = 'sweep-column-mapping';

const describeBytes = (bytes: number) => (bytes >= 1024 * 1024 ? `${+(bytes / (1024 * 1024)).toFixed(1)} MB` : `${bytes} bytes`);

/** A multer storage that streams the file through csv-parse instead of buffering it. */
function delimitedRowsStorage(): StorageEngine {
  return {
    _handleFile(_request, file, callback) {
      readDelimitedRows(file.stream, { file: file.originalname, maximumRows: uploadLimits.sweepRows })
        .then((table) => callback(null, { table } as Partial<Express.Multer.File>))
        .catch((error) => {
          file.stream.resume();
          callback(error);
        });
    },
    _removeFile(_request, _file, callback) {
      callback(null);
    },
  };
}

function runMulter(middleware: ReturnType<ReturnType<typeof multer>['single']>, limitBytes: number, request: Request, response: Response): Promise<void> {
  return new Promise((resolve, reject) => {
    middleware(request, response, (error?: unknown) => {
      if (!error) return resolve();
      if (error instanceof MulterError) {
        if (error.code === 'LIMIT_FILE_SIZE') {
          return reject(new HttpError(413, `The file in "${error.field}" is larger than the ${describeBytes(limitBytes)} allowed per file`));
        }
        if (error.code === 'LIMIT_FILE_COUNT') return reject(new HttpError(413, `At most ${uploadLimits.captureFiles} captures can be uploaded at once`));
        if (error.code === 'LIMIT_UNEXPECTED_FILE') return reject(badRequest(`Unexpected file field "${error.field}"`, { [error.field ?? 'file']: 'unexpected file field' }));
        return reject(badRequest(`Upload refused: ${error.message}`));
      }
      reject(error);
    });
  });
}

const uploaders = new WeakMap<AppContext['config'], { sweep: ReturnType<ReturnType<typeof multer>['single']>; captures: ReturnType<ReturnType<typeof multer>['array']> }>();
/** The multer middleware for this server's configured limits (built once per configuration). */
function uploadersFor(config: AppContext['config']) {
  let built = uploaders.get(config);
  if (!built) {
    built = {
      sweep: multer({ storage: delimitedRowsStorage(), limits: { fileSize: config.uploads.sweepFileBytes, files: 1, fields: 20 } }).single('file'),
      captures: multer({ storage: multer.memoryStorage(), limits: { fileSize: config.uploads.captureFileBytes, files: uploadLimits.captureFiles, fields: 20 } }).array('files', uploadLimits.captureFiles),
    };
    uploaders.set(config, built);
  }
  return built;
}

async function requireOpenSession(sessionId: string): Promise<void> {
  const session = await BenchSession.findByPk(sessionId);
  if (!session) throw notFound('No such bench session');
  if (session.status === 'archived') throw conflict('This bench session is archived; sweeps cannot be added');
}

async function respondWithSweeps(context: AppContext, sessionId: string, sweeps: Sweep[], response: Response): Promise<void> {
  const loaded = await Sweep.findAll({ where: { id: sweeps.map((sweep) => sweep.id) }, include: [{ model: User, as: 'createdBy' }, { model: User, as: 'deletedBy' }] });
  const stats = await sweepPointStats(context.database.sequelize, sweeps.map((sweep) => sweep.id));
  context.hub.publish(sessionId, { type: 'session-changed', sessionId, reason: 'sweep-added' });
  context.hub.requestRefit(sessionId);
  response.status(201).json({ sweeps: loaded.map((sweep) => presentSweep(sweep, stats.get(sweep.id))) });
}

/** POST /api/sessions/:id/sweeps (multipart: file, mode, optional mapping JSON, averageRepeats, rememberMapping). */
export async function handleSweepUpload(context: AppContext, sessionId: string, request: Request, response: Response): Promise<void> {
  await requireOpenSession(sessionId);
  await runMulter(uploadersFor(context.config).sweep, context.config.uploads.sweepFileBytes, request, response);
  const file = request.file as (Express.Multer.File & { table?: DelimitedRows }) | undefined;
  if (!file?.table) throw badRequest('Attach the sweep file in the "file" field', { file: 'required' });
  const fields = uploadSweepFieldsSchema.safeParse(request.body ?? {});
  if (!fields.success) {
    const issues = fieldsFromZod(fields.error);
    throw badRequest(`Invalid upload: ${Object.entries(issues).map(([field, message]) => `${field}: ${message}`).join('; ')}`, issues);
  }
  const { table } = file;
  const mapping = fields.data.mapping ?? canonicalMapping(table.header);
  if (!mapping) {
    throw badRequest(
      `${file.originalname}: the columns (${table.header.join(', ')}) are not the canonical frequency_hz, vin_v, vout_v; say which column is which`,
      { mapping: 'required for this header' },
    );
  }
  const builder = createSweepBuilder(table.header, engineColumnMapping(mapping), {
    file: file.originalname,
    averageRepeats: fields.data.averageRepeats,
    allowDecimalComma: table.delimiter !== ',',
    headerLine: table.headerLine,
    functionName: 'upload',
  });
  for (const row of table.rows) builder.addRow(row.line, row.cells);
  const sweep = builder.finish();

  const written = await addCompleteSweeps(context.database.sequelize, {
    sessionId,
    createdBy: response.locals.user,
    sweeps: [{ mode: fields.data.mode, source: 'upload', sourceName: file.originalname, points: pointRowsFromSweep(sweep) }],
  });
  if (fields.data.mapping && fields.data.rememberMapping) {
    await UserPreference.upsert({ userId: response.locals.user.id, key: columnMappingPreferenceKey, value: { header: table.header, mapping: fields.data.mapping } });
  }
  await respondWithSweeps(context, sessionId, written, response);
}

const captureFieldsSchema = z.object({
  tags: z
    .string({ error: 'Tag each capture (tags: JSON list of { file, mode, frequencyHz })' })
    .transform((text, issueContext) => {
      try {
        return JSON.parse(text) as unknown;
      } catch {
        issueContext.addIssue({ code: 'custom', message: 'tags is not valid JSON' });
        return z.NEVER;
      }
    })
    .pipe(captureTagsSchema),
  inputVoltsPerFullScale: z.coerce.number().positive('must be above zero').finite().default(1),
  outputVoltsPerFullScale: z.coerce.number().positive('must be above zero').finite().default(1),
  averageRepeats: z.enum(['true', 'false']).default('false').transform((value) => value === 'true'),
});

/**
 * POST /api/sessions/:id/captures (multipart: files[], tags JSON). Each capture is fitted (IEEE Std
 * 1057 sine fits) and becomes one point of the sweep of its mode: amplitudes stored as RMS, and a
 * floor equal to the noise-limited standard deviation of the fitted output amplitude,
 * residualRms·sqrt(2/n) peak, i.e. residualRms/sqrt(n) RMS (least-squares covariance for white
 * noise; common practice, no source).
 */
export async function handleCaptureUpload(context: AppContext, sessionId: string, request: Request, response: Response): Promise<void> {
  await requireOpenSession(sessionId);
  await runMulter(uploadersFor(context.config).captures, context.config.uploads.captureFileBytes, request, response);
  const files = (request.files as Express.Multer.File[] | undefined) ?? [];
  if (files.length === 0) throw badRequest('Attach at least one capture in the "files" field', { files: 'required' });
  const fields = captureFieldsSchema.safeParse(request.body ?? {});
  if (!fields.success) {
    const issues = fieldsFromZod(fields.error);
    throw badRequest(`Invalid upload: ${Object.entries(issues).map(([field, message]) => `${field}: ${message}`).join('; ')}`, issues);
  }
  const tags = new Map(fields.data.tags.map((tag) => [tag.file, tag]));
  const names = new Set<string>();
  const byMode = new Map<SweepMode, { points: PointRow[]; files: string[] }>();
  files.forEach((file, index) => {
    if (names.has(file.originalname)) throw badRequest(`${file.originalname} is attached twice`, { files: `${file.originalname} attached twice` });
    names.add(file.originalname);
    const tag = tags.get(file.originalname);
    if (!tag) throw badRequest(`${file.originalname} has no tag: say whether it is a differential or common-mode capture`, { tags: `missing for ${file.originalname}` });
    const capture = parseCaptureFile(new Uint8Array(file.buffer.buffer, file.buffer.byteOffset, file.buffer.byteLength), { file: file.originalname });
    const scaleIn = capture.unit === 'full-scale' ? fields.data.inputVoltsPerFullScale : 1;
    const scaleOut = capture.unit === 'full-scale' ? fields.data.outputVoltsPerFullScale : 1;
    const fit = fitCapture(
      { input: capture.input, output: capture.output, sampleRateHz: capture.sampleRateHz, startTimeS: capture.startTimeS, file: file.originalname },
      tag.frequencyHz ? { frequencyHz: tag.frequencyHz } : {},
    );
    const entry = byMode.get(tag.mode) ?? { points: [], files: [] };
    entry.points.push({
      sequence: entry.points.length + 1,
      frequencyHz: fit.frequencyHz,
      vinV: (fit.input.amplitude * scaleIn) / Math.SQRT2,
      voutV: (fit.output.amplitude * scaleOut) / Math.SQRT2,
      phaseDeg: fit.phaseDeg,
      floorV: (fit.output.residualRms * scaleOut) / Math.sqrt(fit.samples),
      sourceLine: index + 1,
    });
    entry.files.push(file.originalname);
    byMode.set(tag.mode, entry);
  });
  for (const [mode, entry] of byMode) {
    // The same checks as any sweep: positive values, one capture per frequency unless averaging.
    const accumulator = createSweepAccumulator({ file: `${mode} captures`, averageRepeats: fields.data.averageRepeats, functionName: 'captures', hasPhase: true, hasFloor: true });
    entry.points.forEach((point, index) => {
      try {
        accumulator.add({ line: index + 1, frequencyHz: point.frequencyHz, vinVolts: point.vinV, voutVolts: point.voutV, phaseDeg: point.phaseDeg, floorVolts: point.floorV });
      } catch (error) {
        if (error instanceof EngineInputError) throw new EngineInputError(error.message, { file: entry.files[index] });
        throw error;
      }
    });
    if (entry.points.length >= 2) {
      const sweep = accumulator.finish();
      entry.points = pointRowsFromSweep(sweep).map((point) => ({ ...point, sourceLine: null }));
    }
  }
  const written = await addCompleteSweeps(context.database.sequelize, {
    sessionId,
    createdBy: response.locals.user,
    sweeps: [...byMode].map(([mode, entry]) => ({
      mode,
      source: 'captures' as const,
      sourceName: entry.files.length === 1 ? entry.files[0] : `${entry.files.length} captures`,
      points: entry.points,
    })),
  });
  await respondWithSweeps(context, sessionId, written, response);
}
