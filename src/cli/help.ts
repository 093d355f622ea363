import { VERSION } from '../interpret.js';
import { DEFAULT_SMOOTHING } from '../model/layeredInversion.js';

const HEADER = `hammerline ${VERSION}: seismic-refraction interpretation for shallow site investigation

Usage:
  hammerline interpret FILE.csv [FILE.csv ...] [options]
  hammerline interpret SHOT.seg2 [SHOT.seg2 ...] [geometry and picking options] [options]
  hammerline interpret PROJECT.json [options]
  hammerline report FILE.csv | SHOT.seg2 ... | PROJECT.json -o REPORT.html [--pdf REPORT.pdf] [job details] [exports] [interpret options]
  hammerline pick SHOT.seg2 [SHOT.seg2 ...] [-o FILE.csv] [geometry and picking options]
  hammerline records SHOT.seg2 [...] [--json]
  hammerline tomography FILE.csv | SHOT.seg2 ... [--contour V] [--json] [-o FILE] [--grid-csv FILE]
  hammerline site --layer THICKNESS:VELOCITY[:SE] [--layer ...] [--halfspace VELOCITY[:SE]] [options]
  hammerline --help | --version

`;

const INTERPRET = `interpret: reads first-break tables (CSV: source_id, source_x, source_elev, receiver_x,
receiver_elev, time_ms or time_s, optional wave), SEG-2 records, or a project file saved by the
field app (hammerline/project@1: its records or table with the picks set by hand and its
choices; an option given here replaces the project's choice), and prints layer velocities with
their standard errors, the depth to each refractor under every geophone (plus-minus, GRM and
delay-time; intercept-time under the sources; the layered inversion, recommended when it fits
the picks better), reciprocal times, a forward check of the section,
the site class where it can be had, and every warning and caution.

Options for interpret:
  --json                   print the JSON document (schema hammerline/interpretation@1; one
                           document for one file, an array for several); always in metres and m/s
  -o, --output FILE        write the summary or JSON to FILE instead of stdout (whole or not at all)
  --depths FILE.csv        also write the depth table by geophone (x, ground elevation, and for each
                           refractor depth, standard error, elevation and method), with the layer
                           velocities, cautions and warnings as # lines above the header
  --units m|ft             unit of lengths in the input and of the summary (default m; velocities
                           then in ft/s)
  --wave P|S               wave type of the picks, when the table has no wave column (default P);
                           with SEG-2 records, also the wave to pick (see --wave below)
  --segments N | BRANCH=N  fix the number of segments (1 to 4) for every branch or for one branch;
                           a branch is SOURCE:forward (+x side) or SOURCE:reverse (-x side)
  --breakpoint BRANCH=OFFSET[,OFFSET...]
                           fix where new segments start on a branch, as offsets in the input unit
  --max-segments N         most segments the criterion may choose (1 to 4, default 4)
  --through-origin         force the direct-wave segment through the origin (common practice
                           where the trigger is sound)
  --allow-short-branches   leave out sides of a source with fewer than 3 picks instead of stopping
  --no-inversion           keep the depths of the delay-time methods: no layered inversion
                           (by default refractor depths and layer velocities are refined until
                           first arrivals through the section fit every pick, off-end shots
                           included, and kept when that lowers the RMS misfit by 5 % and by
                           0.03 ms or more)
  --inversion-smoothing W  smoothness weight of the refractors in the inversion (default ${DEFAULT_SMOOTHING};
                           0 follows every pick, larger is smoother)
  --inversion-nodes D      spacing of the refractor nodes in the inversion, in the input unit
                           (default the geophone spacing)
  --lateral-gradient       let each layer's velocity change linearly along the line
  -q, --quiet              no progress messages on stderr
  --accept-velocities      read times and lengths as given even where their median apparent
                           velocity lies outside what the ground gives (P 50-8000 m/s, S 30-5000
                           m/s; the check that catches seconds in time_ms, feet as metres, a
                           SEG-2 SAMPLE_INTERVAL in milliseconds); a warning instead of a stop

`;

const SITE_CLASS = `Site class (Vs30; ASCE 7-16, ASCE 7-22, EN 1998-1:2004), printed for S-wave lines, or for P-wave
lines given a Poisson's ratio:
  --poisson NU[,NU...]     Poisson's ratio, one for every layer or one per layer top down, to
                           ESTIMATE Vs from Vp (the classes are then labelled estimated)
  --vp-vs R[,R...]         the same as a Vp/Vs ratio
  --layer-poisson N:NU     Poisson's ratio of layer N alone (1 = top); repeatable. A layer whose
                           Vp lies in 1400-2000 m/s (saturated soil) or below it needs its own
                           value (this, --layer-vs, or a --poisson list): one ratio for all
                           layers is not used there, and no class is estimated without it
  --layer-vs N:VS[:SE]     shear-wave velocity of layer N (m/s, or ft/s with --units ft), for
                           example from a downhole test; repeatable
  --p-line FILE.csv        the P-wave line over the same ground (its first-break table): every
                           Vs is compared with the Vp at the same depth, and Vp/Vs with its
                           plausible range; shown in the summary and the JSON
  --draws N                Monte Carlo draws (at least 2000, default 4000)
  --seed N                 Monte Carlo seed (default 1)

`;

const RECORDS = `Shot records (SEG-2; recognised by their first bytes, whatever the name). Several records given
to interpret are the shots of one line: they are picked, then interpreted together.
  --source-x X             source position along the line (for records whose headers lack it;
                           a negative value is joined with =, as --source-x=-6)
  --first-receiver X --spacing D
                           receiver positions X + (channel - 1) × D (for headers without them)
  --stations FILE.csv      station table (x, elev, optional station): ground elevations, and
                           positions of records that give only station numbers
  --bandpass LOW,HIGH      4th-order Butterworth band-pass before picking, zero phase, in Hz
  --wave P|S               P (default): pick the first break. S: SH records (beam source,
                           horizontal geophones): pick the shear onset after the weaker P arrival;
                           records sharing a source position and receivers are combined (those of
                           opposite S polarity subtracted, which cancels the P), and warned about
                           when they do not reverse the S or do not cancel the P
  --no-pairs               with --wave S, pick every record on its own
  pick writes the first-break table (with confidence, source_file and trace columns); traces
  left unpicked (dead, no clear onset, inconsistent with their neighbours) are listed on stderr.

`;

const REPORT = `report: the report of one line for a permit packet, as one self-contained HTML file (figures
inline, nothing loaded from anywhere) that prints to PDF on A4 or Letter; every option of
interpret applies (--wave S, --poisson, --p-line, --stations, --segments ...). A project file of
the field app (PROJECT.json) gives the line with the picks set by hand, listed in the quality
checks beside the picks they replaced, in the project's unit unless --units is given. With --units ft
every length and velocity of the report is in ft and ft/s (the metric value in brackets in its
sentences), while the JSON, CSV and GeoJSON keep metres as their field names say.
  -o, --output FILE.html   the report (whole or not at all; never over an input file)
  --pdf FILE.pdf           also print it to PDF with Chromium (/usr/bin/chromium, Debian package
                           chromium; HAMMERLINE_CHROMIUM overrides the path)
  --paper A4|Letter        paper of the print layout (default A4)
  --issued YYYY-MM-DD      date of issue printed on the report (default today)
  --depths-csv FILE.csv    the depth profile by geophone (units in the column names; cells a
                           spreadsheet could run as formulas neutralised)
  --geojson FILE.geojson   the line and a point per geophone with its depths (RFC 7946, WGS 84);
                           needs --line-start and --line-end
  --json FILE.json         the JSON interpretation, with the layout and job details the report shows
  --tomography             also run the traveltime tomography (default settings, as hammerline
                           tomography) and show it beside the layered section, with its cautions
  Job details, shown at the top (missing ones are listed in the report and on stderr):
  --job FILE               a sidecar file: JSON, or lines of "key: value" with the keys client,
                           project, site, line, date, operator, equipment, source_type,
                           geophone_spacing_m, line_start, line_end, elevation_datum
  --client, --project, --site, --line TEXT, --date YYYY-MM-DD, --operator, --equipment,
  --source-type TEXT, --geophone-spacing D, --elevation-datum TEXT
                           the same as options (an option replaces the file's field)
  --line-start LON,LAT --line-end LON,LAT
                           WGS 84 positions of the first and last geophone, decimal degrees,
                           longitude first (a negative longitude is joined with =)

`;

const SITE = `site: classes a hand-entered shear-wave profile (for example from a downhole test):
  --layer T:V[:SE]         a layer T thick (m, or ft with --units ft) at shear-wave velocity V
                           (m/s or ft/s), with an optional standard error of V; top down, repeatable
  --halfspace V[:SE]       velocity below the last layer (default: the last layer continues)
  --estimated              the velocities are estimates, not measurements
  --json                   print the JSON document (schema hammerline/site@1), in m and m/s
  -o, --output FILE        write the summary or JSON to FILE instead of stdout
  --units m|ft             unit of thicknesses and velocities given and printed (default m)
  --draws N                Monte Carlo draws (at least 2000, default 4000); with no standard
                           error given, no Monte Carlo runs and no probability is printed
  --seed N                 Monte Carlo seed (default 1)

`;

const EXIT = `Exit status: 0 success, 2 bad input (message on stderr; in a batch, a bad file or record is
reported and skipped and the others are done), 1 internal error (a fault of the program).
`;

/** The text of hammerline --help: every command. */
export const HELP = HEADER + INTERPRET + SITE_CLASS + RECORDS + REPORT + SITE + EXIT;

/** The help of one command (hammerline COMMAND --help): its own usage and options only. */
export function commandHelp(command: 'interpret' | 'pick' | 'records' | 'site' | 'report'): string {
  const usage = (prefix: string) => `hammerline ${VERSION}\n\nUsage:\n${HEADER.split('\n').filter((l) => l.startsWith(`  hammerline ${prefix}`)).join('\n')}\n\n`;
  if (command === 'interpret') return usage('interpret') + INTERPRET + SITE_CLASS + RECORDS.replace(/  pick writes[\s\S]*$/, '\n') + EXIT;
  if (command === 'pick') return usage('pick') + 'pick: picks the first breaks of SEG-2 shot records automatically and writes the first-break table.\n  -o, --output FILE.csv    write the table to FILE instead of stdout\n  --units m|ft             unit of the positions given and written (default m)\n  -q, --quiet              no progress messages on stderr\n' + RECORDS + EXIT;
  if (command === 'records') return usage('records') + 'records: prints the headers and geometry of SEG-2 shot records.\n  --json                   print them as JSON\n\n' + EXIT;
  if (command === 'report') return usage('report') + REPORT + '(the options of interpret: hammerline interpret --help)\n\n' + EXIT;
  return usage('site') + SITE + EXIT;
}

/** The text of hammerline tomography --help. */
export const TOMOGRAPHY_HELP = `hammerline tomography: first-arrival traveltime tomography of one line

Usage:
  hammerline tomography FILE.csv [options]
  hammerline tomography SHOT.seg2 [SHOT.seg2 ...] [geometry and picking options] [options]

A smooth velocity image of the ground that assumes no layers, made from the same first breaks as
interpret: slowness on a grid of nodes, times by fast marching, the fit by quasi-Newton iterations
with smoothing, stopped when the picks are fitted to their noise. It is run from two starting
models (a velocity increasing with depth, and the layered interpretation) and both are reported.

Options:
  --contour V[,V...]       report the depth of the V velocity contour at every geophone (in m/s,
                           or ft/s with --units ft), beside the layered refractor depth; repeatable
  --json                   print the JSON document (schema hammerline/tomogram@1), always SI
  -o, --output FILE        write the summary or JSON to FILE (whole or not at all)
  --grid-csv FILE          also write the grid as CSV (x, depth, elevation, velocity, coverage)
  --cell D                 node spacing (default half the geophone spacing)
  --depth D                depth of the grid below the lowest ground (default a third of the
                           longest offset, at least 10 m)
  --velocity-range LOW,HIGH  velocities the tomogram may use (default 100,6000 m/s)
  --smoothing H,V          weights of horizontal and vertical roughness (default 1,1)
  --pick-noise MS          pick noise in ms (default estimated from neighbouring picks)
  --max-iterations N       most iterations per starting model (default 60)
  --units m|ft, --wave P|S, and the geometry and picking options of interpret
`;
