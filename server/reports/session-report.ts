// The printable report of one bench session (PDF, pdfkit): metadata, the CMRR chart, the fit,
// the verdict against the limit mask, every point, and the safety note where the drive was
// hazardous. Drawn in vector; series are told apart by line style and marker, so it reads in grey.
import PDFDocument from 'pdfkit';
import type { SessionAnalysis } from '../../shared/schemas/analysis';
import type { BenchSessionDetail, Drive } from '../../shared/schemas/bench-sessions';
import { topologyLabels, type Circuit, type LimitMaskData } from '../../shared/schemas/designs';
import { registerPdfFonts, writeText } from './pdf-text';

export interface SessionReportInput {
  session: BenchSessionDetail;
  design: { name: string; revisionLabel: string; circuit: Circuit; limitMask: LimitMaskData };
  analysis: SessionAnalysis;
  verdict: string;
  generatedAt: Date;
  appVersion: string;
}

const page = { width: 595.28, height: 841.89, margin: 48 };
const ink = '#1b2630';
const muted = '#5b6b78';

function formatHz(frequencyHz: number): string {
  if (frequencyHz >= 1e6) return `${+(frequencyHz / 1e6).toPrecision(4)} MHz`;
  if (frequencyHz >= 1e3) return `${+(frequencyHz / 1e3).toPrecision(4)} kHz`;
  return `${+frequencyHz.toPrecision(4)} Hz`;
}
const formatDb = (value: number | null | undefined, digits = 1) => (value === null || value === undefined || !Number.isFinite(value) ? '–' : `${value.toFixed(digits)} dB`);
const formatDrive = (drive: Drive) => `${drive.acVolts} V ${drive.acConvention}${drive.dcVolts ? ` on ${drive.dcVolts} V dc` : ''}`;
const formatInterval = (interval: [number, number] | null, format: (value: number) => string) => (interval ? ` (95 %: ${format(interval[0])} to ${format(interval[1])})` : '');

function keyValueRows(doc: PDFKit.PDFDocument, rows: [string, string][], x: number, width: number): void {
  for (const [key, value] of rows) {
    const y = doc.y;
    writeText(doc, 'body', 8.5, key, { x, y, width: 110 });
    const keyBottom = doc.y;
    writeText(doc, 'body', 8.5, value, { x: x + 115, y, width: width - 115 });
    doc.y = Math.max(doc.y, keyBottom) + 2;
  }
}

function drawChart(doc: PDFKit.PDFDocument, input: SessionReportInput, top: number): number {
  const { analysis, design } = input;
  const left = page.margin + 40;
  const width = page.width - 2 * page.margin - 50;
  const height = 230;
  const bottom = top + height;
  const frequencies = analysis.points.map((point) => point.frequencyHz);
  const maskFrequencies = design.limitMask.points.map((point) => point.frequencyHz);
  const allFrequencies = [...frequencies, ...maskFrequencies];
  const minimumHz = 10 ** Math.floor(Math.log10(Math.min(...allFrequencies)));
  const maximumHz = 10 ** Math.ceil(Math.log10(Math.max(...allFrequencies)));
  const values = [
    ...analysis.points.map((point) => point.cmrrDb),
    ...design.limitMask.points.map((point) => point.minimumCmrrDb),
    ...analysis.prediction.flatMap((point) => [point.cmrrBandLowDb, point.cmrrBandHighDb]).filter((value): value is number => value !== null),
  ];
  const lowDb = Math.floor((Math.min(...values) - 5) / 10) * 10;
  const highDb = Math.ceil((Math.max(...values) + 5) / 10) * 10;
  const xOf = (frequencyHz: number) => left + (width * Math.log10(frequencyHz / minimumHz)) / Math.log10(maximumHz / minimumHz);
  const yOf = (valueDb: number) => bottom - (height * (valueDb - lowDb)) / (highDb - lowDb);

  doc.save();
  doc.lineWidth(0.4).strokeColor('#c9d1d8');
  for (let decade = minimumHz; decade <= maximumHz * 1.0001; decade *= 10) {
    for (const step of [1, 2, 5]) {
      const frequencyHz = decade * step;
      if (frequencyHz > maximumHz * 1.0001) continue;
      doc.moveTo(xOf(frequencyHz), top).lineTo(xOf(frequencyHz), bottom).stroke();
      if (step === 1) writeText(doc, 'mono', 7, formatHz(frequencyHz), { x: xOf(frequencyHz) - 20, y: bottom + 4, width: 40, align: 'center' });
    }
  }
  const stepDb = highDb - lowDb > 80 ? 20 : 10;
  for (let valueDb = lowDb; valueDb <= highDb; valueDb += stepDb) {
    doc.moveTo(left, yOf(valueDb)).lineTo(left + width, yOf(valueDb)).stroke();
    writeText(doc, 'mono', 7, `${valueDb}`, { x: left - 30, y: yOf(valueDb) - 3.5, width: 26, align: 'right' });
  }
  doc.restore();
  writeText(doc, 'body', 7.5, 'CMRR (dB)', { x: page.margin - 8, y: top - 12 });
  writeText(doc, 'body', 7.5, 'Frequency', { x: left + width - 40, y: bottom + 14, width: 40, align: 'right' });
  doc.save().rect(left, top, width, height).clip();

  // Predicted band (op-amp sign cases) as a light fill, predicted CMRR dashed.
  const band = analysis.prediction.filter((point) => point.cmrrBandLowDb !== null && point.cmrrBandHighDb !== null);
  if (band.length > 1) {
    doc.moveTo(xOf(band[0].frequencyHz), yOf(band[0].cmrrBandHighDb!));
    band.forEach((point) => doc.lineTo(xOf(point.frequencyHz), yOf(point.cmrrBandHighDb!)));
    [...band].reverse().forEach((point) => doc.lineTo(xOf(point.frequencyHz), yOf(point.cmrrBandLowDb!)));
    doc.closePath().fillOpacity(0.18).fill('#6f8aa3').fillOpacity(1);
  }
  const predicted = analysis.prediction.filter((point) => point.cmrrDb !== null);
  if (predicted.length > 1) {
    doc.moveTo(xOf(predicted[0].frequencyHz), yOf(predicted[0].cmrrDb!));
    predicted.slice(1).forEach((point) => doc.lineTo(xOf(point.frequencyHz), yOf(point.cmrrDb!)));
    doc.lineWidth(1).dash(5, { space: 3 }).strokeColor('#3f5f7f').stroke().undash();
  }
  // Limit mask: dash-dot, heavier.
  const mask = design.limitMask.points;
  doc.moveTo(xOf(mask[0].frequencyHz), yOf(mask[0].minimumCmrrDb));
  mask.slice(1).forEach((point) => doc.lineTo(xOf(point.frequencyHz), yOf(point.minimumCmrrDb)));
  doc.lineWidth(1.6).dash(7, { space: 2.5 }).strokeColor('#8a3b12').stroke().undash();
  // Fitted curve: solid.
  if (analysis.fit && analysis.fit.fittedCmrrDb.length === analysis.points.length && analysis.fit.model !== 'none') {
    // Where the fit has no value (a smooth description outside its resolved range) the line stops.
    const fitted = analysis.fit.fittedCmrrDb;
    let drawing = false;
    analysis.points.forEach((point, index) => {
      const value = fitted[index];
      if (value === null || !Number.isFinite(value)) {
        drawing = false;
        return;
      }
      if (drawing) doc.lineTo(xOf(point.frequencyHz), yOf(value));
      else doc.moveTo(xOf(point.frequencyHz), yOf(value));
      drawing = true;
    });
    doc.lineWidth(1.2).strokeColor(ink).stroke();
  }
  // Measured: filled circles; lower bounds: open triangles pointing up.
  for (const point of analysis.points) {
    const x = xOf(point.frequencyHz);
    const y = yOf(point.cmrrDb);
    if (point.lowerBound) {
      doc.moveTo(x, y - 3.2).lineTo(x + 3, y + 2).lineTo(x - 3, y + 2).closePath().lineWidth(0.9).strokeColor(ink).stroke();
    } else {
      doc.circle(x, y, 2).fill(ink);
    }
  }
  doc.restore();
  doc.rect(left, top, width, height).lineWidth(0.6).strokeColor(muted).stroke();

  // Legend.
  const legendY = bottom + 28;
  let legendX = left;
  const legendItem = (draw: (x: number, y: number) => void, label: string) => {
    draw(legendX, legendY + 4);
    writeText(doc, 'body', 7.5, label, { x: legendX + 22, y: legendY, lineBreak: false });
    legendX += 22 + doc.widthOfString(label) + 14;
  };
  legendItem((x, y) => doc.circle(x + 8, y, 2).fill(ink), 'measured');
  legendItem((x, y) => doc.moveTo(x + 8, y - 3.2).lineTo(x + 11, y + 2).lineTo(x + 5, y + 2).closePath().lineWidth(0.9).strokeColor(ink).stroke(), 'lower bound (output at floor)');
  legendItem((x, y) => doc.moveTo(x, y).lineTo(x + 16, y).lineWidth(1.2).strokeColor(ink).stroke(), 'fit');
  legendItem((x, y) => doc.moveTo(x, y).lineTo(x + 16, y).lineWidth(1).dash(5, { space: 3 }).strokeColor('#3f5f7f').stroke().undash(), 'predicted (band: op-amp sign)');
  legendItem((x, y) => doc.moveTo(x, y).lineTo(x + 16, y).lineWidth(1.6).dash(7, { space: 2.5 }).strokeColor('#8a3b12').stroke().undash(), 'limit');
  return legendY + 16;
}

/** Writes the report; resolves with the PDF bytes. */
export function renderSessionReport(input: SessionReportInput): Promise<Buffer> {
  const { session, design, analysis } = input;
  const doc = new PDFDocument({
    size: 'A4',
    margins: { top: page.margin, bottom: page.margin, left: page.margin, right: page.margin },
    info: { Title: `Bench session ${session.unitSerial} — ${design.name} ${design.revisionLabel}`, Author: session.operator.name, Creator: `Rejectra ${input.appVersion}` },
    bufferPages: true,
  });
  registerPdfFonts(doc);
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const contentWidth = page.width - 2 * page.margin;

  doc.fillColor(ink);
  writeText(doc, 'body', 8, 'REJECTRA · BENCH SESSION REPORT', { x: page.margin, y: page.margin, characterSpacing: 1 });
  writeText(doc, 'bold', 17, `${session.unitSerial} — ${design.name}, ${design.revisionLabel}`, { x: page.margin, y: page.margin + 14, width: contentWidth });
  doc.moveDown(0.3);
  writeText(doc, 'bold', 11, input.verdict, { width: contentWidth });
  doc.moveDown(0.6);

  if (session.hazardousDrive) {
    const y = doc.y;
    doc.rect(page.margin, y, contentWidth, 46).fillOpacity(0.12).fill('#c47a00').fillOpacity(1).fillColor(ink);
    writeText(doc, 'bold', 8.5, 'Safety: hazardous common-mode drive', { x: page.margin + 8, y: y + 6, width: contentWidth - 16 });
    writeText(doc, 'body', 8, `This session drove ${formatDrive(session.commonModeDrive)} common mode, above about 30 V rms / 60 V dc: hazardous live. Use differential or isolated probes and follow local electrical codes and licensed practice. Rejectra records measurements; it does not certify compliance.`, { width: contentWidth - 16 });
    doc.y = y + 54;
  }

  const temperature = session.ambientTemperatureC === null ? '–' : `${session.ambientTemperatureC} °C`;
  keyValueRows(
    doc,
    [
      ['Unit', session.unitSerial],
      ['Design', `${design.name}, ${design.revisionLabel} (${topologyLabels[design.circuit.topology]})`],
      ['Operator', session.operator.name],
      ['Measured', `${session.measuredAt.replace('T', ' ').slice(0, 16)} UTC`],
      ['Fixture', session.fixture],
      ['Ambient', temperature],
      ['Drive', `differential ${formatDrive(session.differentialDrive)}; common mode ${formatDrive(session.commonModeDrive)}`],
      [
        'Instruments',
        session.instruments.length === 0
          ? '–'
          : session.instruments.map((instrument) => `${instrument.name} (${instrument.model}, s/n ${instrument.serialNumber}; calibration due ${instrument.calibrationDueOn ?? 'not recorded'}${instrument.calibrationState === 'overdue' ? ', OVERDUE' : ''})`).join('; '),
      ],
      ['Record', session.status === 'archived' ? `archived ${session.archivedAt?.slice(0, 10)} by ${session.archivedBy?.name ?? ''}` : 'open'],
      ...(session.notes ? ([['Notes', session.notes]] as [string, string][]) : []),
    ],
    page.margin,
    contentWidth,
  );
  doc.moveDown(0.8);

  if (analysis.status !== 'complete' || analysis.points.length === 0) {
    writeText(doc, 'body', 10, `No CMRR yet: ${analysis.message ?? 'the session has no paired sweeps'}.`, { x: page.margin, width: contentWidth });
  } else {
    doc.y = drawChart(doc, input, doc.y + 14) + 6;
    const fit = analysis.fit!;
    writeText(doc, 'bold', 10.5, 'Fit against frequency', { x: page.margin, width: contentWidth });
    doc.moveDown(0.2);
    keyValueRows(
      doc,
      [
        ['Model', `${fit.model} — ${fit.modelReason}`],
        ['dc CMRR', `${formatDb(fit.cmrrDcDb, 2)}${formatInterval(fit.cmrrDcDbInterval95, (value) => value.toFixed(2))}`],
        ['CMRR corner', `${fit.cmrrCornerHz === null ? '–' : formatHz(fit.cmrrCornerHz)}${formatInterval(fit.cmrrCornerHzInterval95, formatHz)}`],
        ['Bandwidth', `${fit.bandwidthHz === null ? fit.bandwidthNote ?? '–' : formatHz(fit.bandwidthHz)}${formatInterval(fit.bandwidthHzInterval95, formatHz)}`],
        ['High-f slope', fit.highFrequencySlope ? `${fit.highFrequencySlope.dbPerDecade.toFixed(1)} dB/decade${formatInterval(fit.highFrequencySlope.interval95, (value) => value.toFixed(1))}` : '–'],
        ['Residual RMS', `${fit.residualRmsDb.toFixed(2)} dB over ${fit.activePointCount} points (${fit.activeBoundCount} bounds active)`],
        ['Regime', fit.regimeSentence],
        ...(analysis.limits ? ([['Limit', `${analysis.limits.overall}; guard band ${analysis.limits.guardBandDb} dB (ILAC-G8 guarded acceptance)`]] as [string, string][]) : []),
        ...analysis.warnings.map((warning) => ['Note', warning] as [string, string]),
      ],
      page.margin,
      contentWidth,
    );

    doc.addPage();
    writeText(doc, 'bold', 10.5, 'Points', { x: page.margin, y: page.margin, width: contentWidth });
    doc.moveDown(0.3);
    const columns = [
      { title: 'Frequency', width: 70 },
      { title: 'Ad', width: 62 },
      { title: 'Acm', width: 72 },
      { title: 'CMRR', width: 70 },
      { title: 'Predicted', width: 62 },
      { title: 'Limit', width: 52 },
      { title: 'Margin', width: 52 },
      { title: 'Outcome', width: 60 },
    ];
    const header = () => {
      let x = page.margin;
      const y = doc.y;
      for (const column of columns) {
        writeText(doc, 'bold', 7.5, column.title, { x, y, width: column.width });
        x += column.width;
      }
      doc.y = y + 12;
    };
    header();
    analysis.points.forEach((point, index) => {
      if (doc.y > page.height - page.margin - 14) {
        doc.addPage();
        doc.y = page.margin;
        header();
      }
      const verdict = analysis.limits?.verdicts[index];
      const cells = [
        formatHz(point.frequencyHz),
        point.ad.toPrecision(5),
        point.acm.toExponential(3),
        `${point.lowerBound ? '≥ ' : ''}${point.cmrrDb.toFixed(2)} dB`,
        formatDb(analysis.prediction[index]?.cmrrDb),
        formatDb(verdict?.limitDb),
        formatDb(verdict?.marginDb),
        verdict?.outcome ?? '–',
      ];
      let x = page.margin;
      const y = doc.y;
      cells.forEach((cell, column) => {
        writeText(doc, 'mono', 7.5, cell, { x, y, width: columns[column].width, lineBreak: false });
        x += columns[column].width;
      });
      doc.y = y + 11;
    });
  }

  const pages = doc.bufferedPageRange();
  for (let index = 0; index < pages.count; index++) {
    doc.switchToPage(pages.start + index);
    // The footer sits in the bottom margin; without this pdfkit would start a new page for it.
    doc.page.margins.bottom = 0;
    doc.fillColor(muted);
    writeText(doc, 'body', 7, `Rejectra ${input.appVersion} · generated ${input.generatedAt.toISOString().replace('T', ' ').slice(0, 16)} UTC · session ${session.id} · page ${index + 1} of ${pages.count}`, {
      x: page.margin,
      y: page.height - page.margin + 16,
      width: contentWidth,
      lineBreak: false,
    });
    doc.fillColor(ink);
  }
  doc.end();
  return done;
}
