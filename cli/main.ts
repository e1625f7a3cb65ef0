// `rejectra <command> …`: the engine from the command line. Each command lives in
// cli/commands/<command>.ts and exports `run(args: string[]): Promise<number>`
// returning the process exit code.
import { EngineInputError } from '../shared/engine/errors';

const commands: Record<string, () => Promise<{ run(args: string[]): Promise<number> }>> = {
  analyze: () => import('./commands/analyze'),
  capture: () => import('./commands/capture'),
  predict: () => import('./commands/predict'),
  stream: () => import('./commands/stream'),
  tolerance: () => import('./commands/tolerance'),
};

const usage = `usage: rejectra <command> [options]

commands:
  analyze    --differential FILE --common-mode FILE [--json]
  capture    FILE [--frequency HZ] [--json]
  predict    --r1 OHMS --r2 OHMS --r3 OHMS --r4 OHMS [--rs1 OHMS --rs2 OHMS]
             [--open-loop-gain-db DB --gbw-hz HZ --opamp-cmrr-db DB --opamp-cmrr-corner-hz HZ]
             --frequencies F1,F2,... [--json]
  stream     --url URL --token rjt_… --session ID --mode differential|common-mode
             (--file SWEEP.csv | --simulate [--points N --seed S …]) [--rate N] [--batch N] [--json]
  tolerance  --gain G --tolerance FRACTION [--trials N] [--seed S]
             [--distribution uniform|normal] [--json]
`;

async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    process.stdout.write(usage);
    return name ? 0 : 2;
  }
  const load = commands[name];
  if (!load) {
    process.stderr.write(`rejectra: unknown command "${name}"\n\n${usage}`);
    return 2;
  }
  try {
    const command = await load();
    return await command.run(rest);
  } catch (error) {
    if (error instanceof EngineInputError) {
      process.stderr.write(`rejectra ${name}: ${error.message}\n`);
      return 1;
    }
    throw error;
  }
}

process.exitCode = await main(process.argv.slice(2));
