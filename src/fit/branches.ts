import { InputError } from '../core/errors.js';
import type { Branch, FirstBreak, Side } from '../core/types.js';
import type { WarningLog } from '../core/warnings.js';

/** Fewest picks on one side of a source for a line fit with a standard error. */
export const MIN_BRANCH_PICKS = 3;

export interface SplitOptions {
  /** File name for messages. */
  file: string;
  /**
   * Keep going when a side of a source has fewer than three picks: those picks are left out of
   * the fits with a warning. Off by default, since it usually means a wrong source position.
   */
  allowShortBranches?: boolean;
}

/**
 * Splits picks into branches, one per source and side, each sorted by increasing offset.
 * A pick at zero offset joins every branch of its source (it anchors the direct wave).
 * Sources off the ends of the spread give a single branch.
 *
 * @throws InputError when a side of a source has one or two picks (unless allowShortBranches)
 */
export function splitBranches(picks: FirstBreak[], warnings: WarningLog, options: SplitOptions): Branch[] {
  const bySource = new Map<string, FirstBreak[]>();
  for (const p of picks) {
    if (!bySource.has(p.sourceId)) bySource.set(p.sourceId, []);
    bySource.get(p.sourceId)!.push(p);
  }
  const branches: Branch[] = [];
  for (const [sourceId, sourcePicks] of bySource) {
    const { sourceX, sourceElev } = sourcePicks[0];
    const zero = sourcePicks.filter((p) => p.receiverX === sourceX);
    const sides: [Side, FirstBreak[]][] = [
      ['reverse', sourcePicks.filter((p) => p.receiverX < sourceX)],
      ['forward', sourcePicks.filter((p) => p.receiverX > sourceX)],
    ];
    const usable = sides.filter(([, side]) => side.length >= MIN_BRANCH_PICKS);
    for (const [side, sidePicks] of sides) {
      if (sidePicks.length === 0 || sidePicks.length >= MIN_BRANCH_PICKS) continue;
      const rows = sidePicks.map((p) => p.row).join(', ');
      const message = `has ${sidePicks.length} pick${sidePicks.length > 1 ? 's' : ''} on its ${side === 'forward' ? 'forward (+x)' : 'reverse (-x)'} side (row${sidePicks.length > 1 ? 's' : ''} ${rows}); expected at least ${MIN_BRANCH_PICKS} to fit a line`;
      if (!options.allowShortBranches) {
        throw new InputError({ file: options.file, source: sourceId, row: sidePicks[0].row },
          `${message}. Check the source position, or pass --allow-short-branches to leave these picks out`);
      }
      warnings.add('short-branch', `${message}; these picks are left out of the fits`, { where: { file: options.file, source: sourceId } });
    }
    if (usable.length === 0 && zero.length > 0) {
      warnings.add('short-branch', `only zero-offset picks remain for source ${sourceId}; they are left out of the fits`, { where: { file: options.file } });
    }
    for (const [side, sidePicks] of usable) {
      const all = [...zero, ...sidePicks].sort((a, b) => Math.abs(a.receiverX - sourceX) - Math.abs(b.receiverX - sourceX));
      branches.push({
        sourceId,
        sourceX,
        sourceElev,
        side,
        picks: all,
        offsets: all.map((p) => Math.abs(p.receiverX - sourceX)),
        distances: all.map((p) => Math.hypot(p.receiverX - sourceX, p.receiverElev - sourceElev)),
        times: all.map((p) => p.time),
      });
    }
  }
  if (branches.length === 0) {
    throw new InputError({ file: options.file }, `no source has ${MIN_BRANCH_PICKS} or more picks on a side; nothing to interpret`);
  }
  return branches.sort((a, b) => a.sourceX - b.sourceX || (a.side === 'reverse' ? -1 : 1));
}

/**
 * True when a branch starts at its source: its nearest pick with an offset lies within two
 * receiver spacings, so it records the direct wave (a source off the end starts farther out).
 */
export function startsAtSource(branch: Branch, spacing: number): boolean {
  return branch.offsets.find((o) => o > 0)! <= 2.01 * spacing;
}
