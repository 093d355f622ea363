import { escapeHtml } from './escape.js';
import { Figures } from './figures.js';
import { cautionSection, historySection, qualitySection, signatureSection, warningSection } from './sections/checks.js';
import { jobSection, methodSection, summarySection } from './sections/front.js';
import { depthSectionSection, depthTableSection, layerSection, siteSection, timeDistanceSection } from './sections/results.js';
import { reportCss } from './styles.js';
import type { ReportInput } from './types.js';

/** Ids of the report's sections, in the order a reviewer reads them. */
export const REPORT_SECTIONS = ['summary', 'method', 'time-distance', 'depth-section', 'layers', 'depths', 'site', 'qc', 'warnings', 'cautions', 'history', 'signatures'] as const;

/**
 * The permit-packet report of one line as one self-contained HTML document: figures as inline
 * SVG, styles inline, no script, and a content security policy that forbids loading anything,
 * so it opens offline and prints the same anywhere. Every number is taken from the JSON
 * interpretation document in `input.document` and carries its path there (see Figures).
 */
export function reportHtml(input: ReportInput): string {
  const fig = new Figures(input.document, input.unit ?? 'm');
  const job = input.job;
  const name = [job.line ? `Line ${job.line}` : undefined, job.site, job.project].filter(Boolean).join(', ') || input.result.file;
  const footer = `Seismic refraction survey: ${name}. Issued ${input.issued}.`;
  const body = [
    jobSection(input, fig),
    summarySection(input, fig),
    methodSection(input, fig),
    timeDistanceSection(input, fig),
    depthSectionSection(input, fig),
    layerSection(input, fig),
    depthTableSection(input, fig),
    siteSection(input, fig),
    qualitySection(input, fig),
    warningSection(input, fig),
    cautionSection(input, fig),
    historySection(input, fig),
    signatureSection(),
  ].join('\n');
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="hammerline ${escapeHtml(input.version)}">
<title>${escapeHtml(`Seismic refraction survey: ${name}`)}</title>
<style>${reportCss(input.paper, footer)}</style>
</head>
<body>
${body}
</body>
</html>
`;
}
