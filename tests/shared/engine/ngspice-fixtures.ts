// Runs the ngspice netlists kept under tests/fixtures/ngspice/ and reads back
// what they print, for the outside checks of the prediction modules. Each
// netlist writes `ngspice-output.txt` with columns: frequency, re/im of the
// differential-drive output, re/im of the common-mode-drive output.
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { runNgspice } from '../../helpers/reference-tools';

export const NGSPICE_FIXTURES = fileURLToPath(new URL('../../fixtures/ngspice/', import.meta.url));

/** One frequency of an ngspice AC run: magnitudes of the two outputs (1 V drive, so they are |Ad| and |Acm|). */
export interface NgspiceGainRow {
  frequencyHz: number;
  differentialMagnitude: number;
  commonModeMagnitude: number;
}

const SPICE_SCALE: [string, number][] = [
  ['meg', 1e6],
  ['t', 1e12],
  ['g', 1e9],
  ['k', 1e3],
  ['m', 1e-3],
  ['u', 1e-6],
  ['n', 1e-9],
  ['p', 1e-12],
  ['f', 1e-15],
];

/** A SPICE number with its scale suffix ("4.95k", "3meg", "-1") as a plain number. */
export function parseSpiceNumber(text: string): number {
  const match = /^([-+]?(?:\d+\.?\d*|\.\d+)(?:e[-+]?\d+)?)([a-z]*)$/i.exec(text.trim());
  if (!match) throw new Error(`not a SPICE number: "${text}"`);
  const suffix = match[2].toLowerCase();
  const scale = suffix === '' ? 1 : SPICE_SCALE.find(([name]) => suffix.startsWith(name))?.[1];
  if (scale === undefined) throw new Error(`unknown SPICE scale "${suffix}" in "${text}"`);
  return Number(match[1]) * scale;
}

/** The `.param name=value` assignments at the top level of a netlist. */
export function readNetlistParameters(netlistName: string): Record<string, number> {
  const text = readFileSync(join(NGSPICE_FIXTURES, netlistName), 'utf8');
  const parameters: Record<string, number> = {};
  for (const line of text.split('\n')) {
    if (!line.toLowerCase().startsWith('.param ')) continue;
    for (const assignment of line.slice(7).trim().split(/\s+/)) {
      const [name, value] = assignment.split('=');
      parameters[name.toLowerCase()] = parseSpiceNumber(value);
    }
  }
  return parameters;
}

/** Runs one netlist in a fresh temporary folder and returns its rows. */
export function runGainNetlist(netlistName: string): NgspiceGainRow[] {
  const folder = mkdtempSync(join(tmpdir(), 'rejectra-ngspice-'));
  try {
    runNgspice(join(NGSPICE_FIXTURES, netlistName), folder);
    const lines = readFileSync(join(folder, 'ngspice-output.txt'), 'utf8').trim().split('\n');
    return lines.map((line) => {
      const [frequencyHz, differentialRe, differentialIm, commonModeRe, commonModeIm] = line.trim().split(/\s+/).map(Number);
      return {
        frequencyHz,
        differentialMagnitude: Math.hypot(differentialRe, differentialIm),
        commonModeMagnitude: Math.hypot(commonModeRe, commonModeIm),
      };
    });
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
}
