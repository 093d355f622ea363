import { InputError } from '../core/errors.js';
import { formatSe, fromMetres, toMetres } from '../core/units.js';
import { siteJson } from '../io/siteJson.js';
import { VERSION } from '../interpret.js';
import { siteSummary } from '../report/siteSummary.js';
import { assessSite, type SiteInput } from '../site/siteAssessment.js';
import { lengthUnitOption, numberOption, parse, SITE_OPTIONS, siteOptions } from './args.js';
import { commandHelp } from './help.js';
import type { CliIo } from './io.js';

/** hammerline site: the site classes of a hand-entered shear-wave profile. */
export function siteCommand(args: string[], io: CliIo): number {
  const { values, positionals } = parse(args, {
    layer: { type: 'string', multiple: true },
    halfspace: { type: 'string' },
    estimated: { type: 'boolean' },
    json: { type: 'boolean' },
    output: { type: 'string', short: 'o' },
    units: { type: 'string' },
    help: { type: 'boolean', short: 'h' },
    ...SITE_OPTIONS,
  });
  if (values.help) {
    io.stdout(commandHelp('site'));
    return 0;
  }
  if (positionals.length > 0) throw new InputError({}, `site takes a hand-entered profile (--layer, --halfspace), not files; for a line use: hammerline interpret ${positionals[0]}`);
  const unit = lengthUnitOption(values.units as string | undefined);
  const toSi = (v: number) => toMetres(v, unit);
  const layers = ((values.layer as string[] | undefined) ?? []).map((text) => {
    const parts = text.split(':');
    if (parts.length < 2 || parts.length > 3) throw new InputError({}, `--layer ${text}: expected THICKNESS:VELOCITY or THICKNESS:VELOCITY:SE, for example 4:185`);
    const thickness = numberOption('layer', parts[0], `a thickness in ${unit === 'ft' ? 'feet' : 'metres'}`);
    const velocity = numberOption('layer', parts[1], `a velocity in ${unit === 'ft' ? 'ft/s' : 'm/s'}`);
    const se = parts[2] === undefined ? 0 : numberOption('layer', parts[2], 'a standard error of the velocity');
    if (!(thickness > 0) || !(velocity > 0) || se < 0) throw new InputError({}, `--layer ${text}: expected a thickness and a velocity above 0 and a standard error of 0 or more`);
    return { thickness: toSi(thickness), velocity: toSi(velocity), se: toSi(se) };
  });
  if (layers.length === 0) throw new InputError({}, 'site needs at least one --layer THICKNESS:VELOCITY');
  let halfspace: { velocity: number; se: number } | undefined;
  if (values.halfspace !== undefined) {
    const [v, se] = (values.halfspace as string).split(':');
    halfspace = { velocity: toSi(numberOption('halfspace', v, 'a velocity')), se: se === undefined ? 0 : toSi(numberOption('halfspace', se, 'a standard error')) };
    if (!(halfspace.velocity > 0)) throw new InputError({}, `--halfspace ${values.halfspace as string}: expected a velocity above 0`);
  }
  const all = halfspace ? [...layers, { thickness: 0, ...halfspace }] : layers;
  const depths: number[] = [];
  for (let i = 0; i < all.length - 1; i++) depths.push((depths[i - 1] ?? 0) + all[i].thickness);
  const input: SiteInput = {
    velocities: all.map((l) => l.velocity),
    velocitySes: all.map((l) => l.se),
    stations: [{ x: 0, depths, depthSes: depths.map(() => 0) }],
    estimatedFromVp: false,
    estimatedByUser: Boolean(values.estimated),
    source: 'hand-entered',
    profileBase: halfspace ? depths[depths.length - 1] : layers.reduce((a, l) => a + l.thickness, 0),
  };
  const site = assessSite(input, siteOptions(values));
  const output = values.json
    ? JSON.stringify({ schema: 'hammerline/site@1', program: { name: 'hammerline', version: VERSION }, units: { length: 'm', velocity: 'm/s' },
      profile: all.map((l, i) => ({ layer: i + 1, thickness_m: i < layers.length ? Number(l.thickness.toFixed(3)) : null, velocity_mps: Number(l.velocity.toFixed(1)), velocity_se_mps: Number(l.se.toFixed(1)) })),
      site: siteJson(site) }, null, 2) + '\n'
    : [`hammerline ${VERSION}: hand-entered shear-wave profile`, ...all.map((l, i) => `  layer ${i + 1}: ${i < layers.length ? `${fromMetres(l.thickness, unit).toFixed(2)} ${unit}` : 'half-space'} at ${Math.round(fromMetres(l.velocity, unit))} ${unit === 'ft' ? 'ft/s' : 'm/s'}${l.se > 0 ? ` ± ${formatSe(fromMetres(l.se, unit), 0)}` : ''}`), '', ...siteSummary(site, unit)].join('\n') + '\n';
  if (values.output) io.writeText(values.output as string, output);
  else io.stdout(output);
  return 0;
}
