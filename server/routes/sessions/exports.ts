// GET /api/sessions/:id/export.csv, export.json and report.pdf: the session as a record.
import type { Request, Response } from 'express';
import { summariseSession } from '../../../shared/analysis';
import type { SessionAnalysis } from '../../../shared/schemas/analysis';
import type { Circuit } from '../../../shared/schemas/designs';
import type { BenchSessionDetail } from '../../../shared/schemas/bench-sessions';
import type { AppContext } from '../../app-context';
import { csvDocument, safeFileName } from '../../exports/csv';
import { notFound } from '../../http/errors';
import { BenchSession, Design, DesignRevision } from '../../models';
import { renderSessionReport } from '../../reports/session-report';

/** The one-line verdict, capitalised for a heading. */
export function verdictLine(record: { analysis: SessionAnalysis; design: { circuit: Circuit } }): string {
  const { sentence } = summariseSession(record.analysis, record.design.circuit);
  return sentence.charAt(0).toUpperCase() + sentence.slice(1);
}

export async function loadSessionRecord(context: AppContext, sessionId: string, detail: BenchSessionDetail) {
  const session = await BenchSession.findByPk(sessionId, { include: [{ model: DesignRevision, as: 'designRevision', include: [{ model: Design, as: 'design' }] }] });
  if (!session?.designRevision?.design) throw notFound('No such bench session');
  const revision = session.designRevision;
  const analysis = await context.analyses.analyse(
    context.database,
    { id: session.id, designRevisionId: revision.id, circuit: revision.circuit, limitMask: revision.limitMask },
    context.now(),
  );
  return {
    detail,
    design: { name: revision.design!.name, revisionLabel: revision.label, circuit: revision.circuit, limitMask: revision.limitMask },
    analysis,
  };
}

export function sendSessionCsv(record: Awaited<ReturnType<typeof loadSessionRecord>>, response: Response): void {
  const { detail, design, analysis } = record;
  const fit = analysis.fit;
  const comments = [
    `Rejectra bench session ${detail.id}`,
    `unit ${detail.unitSerial}; design ${design.name} ${design.revisionLabel}; operator ${detail.operator.name}; measured ${detail.measuredAt}`,
    `fixture ${detail.fixture}; ambient ${detail.ambientTemperatureC ?? ''} C; instruments ${detail.instruments.map((instrument) => `${instrument.name} s/n ${instrument.serialNumber} cal due ${instrument.calibrationDueOn ?? '-'}`).join('; ')}`,
    `verdict: ${verdictLine(record)}`,
    ...(fit ? [`fit: model ${fit.model}; dc CMRR ${fit.cmrrDcDb ?? ''} dB; corner ${fit.cmrrCornerHz ?? ''} Hz; ${fit.regimeSentence}`] : []),
    'amplitudes are ratios of readings in one convention; cmrr_db of a lower_bound row is a lower bound',
  ];
  const rows = analysis.points.map((point, index) => {
    const verdict = analysis.limits?.verdicts[index];
    return [
      point.frequencyHz,
      point.ad,
      point.acm,
      point.cmrrDb,
      point.lowerBound,
      point.interpolated,
      analysis.prediction[index]?.cmrrDb ?? null,
      analysis.fit?.fittedCmrrDb[index] ?? null,
      verdict?.limitDb ?? null,
      verdict?.marginDb ?? null,
      verdict?.outcome ?? '',
    ];
  });
  response
    .type('text/csv; charset=utf-8')
    .attachment(`${safeFileName(`${detail.unitSerial}-${design.revisionLabel}`)}.csv`)
    .send(csvDocument(comments, ['frequency_hz', 'ad', 'acm', 'cmrr_db', 'lower_bound', 'ad_interpolated', 'predicted_cmrr_db', 'fitted_cmrr_db', 'limit_db', 'margin_db', 'outcome'], rows));
}

export async function sendSessionPdf(context: AppContext, record: Awaited<ReturnType<typeof loadSessionRecord>>, _request: Request, response: Response): Promise<void> {
  const pdf = await renderSessionReport({
    session: record.detail,
    design: record.design,
    analysis: record.analysis,
    verdict: verdictLine(record),
    generatedAt: context.now(),
    appVersion: context.version,
  });
  response.type('application/pdf').attachment(`${safeFileName(`${record.detail.unitSerial}-${record.design.revisionLabel}-report`)}.pdf`).send(pdf);
}
