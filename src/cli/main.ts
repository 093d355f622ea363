import { InputError } from '../core/errors.js';
import { VERSION } from '../interpret.js';
import { HELP } from './help.js';
import { interpretCommand } from './interpret.js';
import { processIo, type CliIo } from './io.js';
import { pickCommand, recordsCommand } from './records.js';
import { reportCommand } from './report.js';
import { siteCommand } from './site.js';
import { tomographyCommand } from './tomography.js';

/**
 * The command line as a function of its arguments, so tests can call it.
 * @returns the exit status: 0 success, 2 bad input, 1 internal error
 */
export function main(argv: string[], io: CliIo = processIo): number {
  try {
    return run(argv, io);
  } catch (error) {
    if (error instanceof InputError) {
      io.stderr(`hammerline: ${error.message}\n`);
      return 2;
    }
    const text = error instanceof Error ? `${error.message}\n${error.stack ?? ''}` : String(error);
    io.stderr(`hammerline: internal error (please report it with the input that caused it): ${text}\n`);
    return 1;
  }
}

function run(argv: string[], io: CliIo): number {
  const [command, ...rest] = argv;
  if (command === undefined || command === '--help' || command === '-h' || command === 'help') {
    io.stdout(HELP);
    return command === undefined ? 2 : 0;
  }
  if (command === '--version' || command === '-v') {
    io.stdout(`hammerline ${VERSION}\n`);
    return 0;
  }
  if (command === 'interpret') return interpretCommand(rest, io);
  if (command === 'site') return siteCommand(rest, io);
  if (command === 'pick') return pickCommand(rest, io);
  if (command === 'records') return recordsCommand(rest, io);
  if (command === 'report') return reportCommand(rest, io);
  if (command === 'tomography') return tomographyCommand(rest, io);
  throw new InputError({}, `unknown command "${command}"; expected interpret, report, pick, records, site or tomography (see hammerline --help)`);
}
