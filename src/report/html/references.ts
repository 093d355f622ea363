import type { HistoryStep } from '../../core/types.js';

/** A published method and where it is described. */
export interface MethodReference {
  method: string;
  purpose: string;
  references: string[];
}

const TELFORD = 'Telford, W. M., Geldart, L. P. & Sheriff, R. E. (1990). Applied Geophysics, 2nd ed., Cambridge University Press, chapter 4.';
const REDPATH = 'Redpath, B. B. (1973). Seismic refraction exploration for engineering site investigations. US Army Engineer Waterways Experiment Station, Technical Report E-73-4.';

/** The depth methods by the name the interpretation records them under. */
const DEPTH_METHODS: Record<string, MethodReference> = {
  'intercept-time': { method: 'Intercept-time method', purpose: 'depth to each refractor under the sources', references: [TELFORD, REDPATH] },
  'plus-minus': { method: 'Plus-minus method', purpose: 'depth under each geophone between a reversed pair of sources', references: ['Hagedoorn, J. G. (1959). The plus-minus method of interpreting seismic refraction sections. Geophysical Prospecting 7, 158–182.'] },
  GRM: { method: 'Generalized reciprocal method (GRM)', purpose: 'depth under each geophone, with the optimum XY distance from the velocity analysis', references: ['Palmer, D. (1980). The Generalized Reciprocal Method of Seismic Refraction Interpretation. Society of Exploration Geophysicists, Tulsa.', 'Palmer, D. (1981). An introduction to the generalized reciprocal method of seismic refraction interpretation. Geophysics 46, 1508–1518.'] },
  'delay-time': { method: 'Delay-time method (least squares over all sources)', purpose: 'depth under each geophone from every head-wave pick', references: ['Gardner, L. W. (1939). An areal plan of mapping subsurface structure by refraction shooting. Geophysics 4, 247–259.'] },
};

/** A step's name compared without case or separators: "segmented_regression" is "segmentedRegression". */
function stepIs(step: HistoryStep, name: string): boolean {
  return step.step.replace(/[_\s-]/g, '').toLowerCase() === name.toLowerCase();
}

/** A step's parameter by its snake_case name, or by the camelCase spelling of it. */
export function parameter(step: HistoryStep | undefined, snake: string): unknown {
  if (step === undefined) return undefined;
  const camel = snake.replace(/_([a-z])/g, (_, c: string) => c.toUpperCase());
  return step.parameters[snake] ?? step.parameters[camel];
}

/** The step of the history with the given name (see stepIs). */
export function findStep(history: HistoryStep[], name: string): HistoryStep | undefined {
  return history.find((s) => stepIs(s, name));
}

const JOHNSON = 'Johnson, S. H. (1976). Interpretation of split-spread refraction data in terms of plane dipping layers. Geophysics 41, 418–424.';

/**
 * The methods the processing history shows were used, each with its published reference, in the
 * order they were applied. Steps the program does not know by name are listed with no reference
 * (the history table gives their parameters).
 */
export function methodReferences(history: HistoryStep[], options: { picked: boolean; bandPass: boolean; extrapolated: boolean; estimatedFromVp: boolean; tomogram?: boolean; depthMethodsWithDepths?: Set<string> }): MethodReference[] {
  const out: MethodReference[] = [];
  if (options.picked) {
    out.push({ method: 'STA/LTA trigger', purpose: 'automatic detection of the first break on each trace', references: ['Allen, R. V. (1978). Automatic earthquake recognition and timing from single traces. Bulletin of the Seismological Society of America 68, 1521–1532.'] });
    out.push({ method: 'Akaike information criterion (AIC) picker', purpose: 'onset time of the first break', references: ['Maeda, N. (1985). A method for reading and checking phase times in auto-processing system of seismic wave data. Zisin (Journal of the Seismological Society of Japan) 38, 365–379.', 'Sleeman, R. & van Eck, T. (1999). Robust automatic P-phase picking: an on-line implementation in the analysis of broadband seismogram recordings. Physics of the Earth and Planetary Interiors 113, 265–275.'] });
    if (options.bandPass) out.push({ method: 'Butterworth band-pass filter (zero phase)', purpose: 'noise suppression before picking', references: ['Butterworth, S. (1930). On the theory of filter amplifiers. Wireless Engineer 7, 536–541.'] });
  }
  for (const step of history) {
    if (stepIs(step, 'splitBranches')) continue;
    if (stepIs(step, 'segmentedRegression')) {
      out.push({ method: 'Segmented least-squares regression of time against offset', purpose: 'apparent velocities, intercept times and crossover distances of each branch; the number of segments by the Bayesian information criterion; outliers by the modified z-score', references: ['Schwarz, G. (1978). Estimating the dimension of a model. Annals of Statistics 6, 461–464.', 'Iglewicz, B. & Hoaglin, D. C. (1993). How to Detect and Handle Outliers. ASQC Quality Press, Milwaukee.'] });
      if (parameter(step, 'statics') === true) out.push({ method: 'Refraction statics (receiver delay times)', purpose: 'segmentation of branches straightened for near-surface delays', references: [DEPTH_METHODS['delay-time'].references[0]] });
    } else if (stepIs(step, 'layers')) {
      const johnson = /johnson/i.test(String(parameter(step, 'true_velocity') ?? ''));
      out.push({ method: johnson ? 'True velocities and dips of plane dipping layers, not necessarily parallel' : 'True velocity and dip from reversed apparent velocities', purpose: 'layer velocities and refractor dips from the forward and reverse apparent velocities', references: johnson ? [JOHNSON, TELFORD] : [TELFORD] });
    } else if (stepIs(step, 'depths')) {
      const listed = parameter(step, 'methods');
      const methods = (Array.isArray(listed) ? (listed as string[]) : []).filter((m) => options.depthMethodsWithDepths?.has(m) ?? true);
      for (const m of methods) out.push(DEPTH_METHODS[m] ?? { method: m, purpose: 'depth to the refractors', references: [] });
      out.push({ method: 'Reciprocal-time check', purpose: 'consistency of the picks of reversed sources', references: [REDPATH] });
      out.push({ method: 'Hidden-layer (blind-zone) limit', purpose: 'the thickest layer that could lie unseen above each refractor', references: ['Soske, J. L. (1959). The blind zone problem in engineering geophysics. Geophysics 24, 359–365.'] });
    } else if (stepIs(step, 'site')) {
      out.push({ method: 'Time-averaged shear-wave velocity and site classes', purpose: 'Vs30 and the site class of each standard', references: ['ASCE/SEI 7-16, Minimum Design Loads and Associated Criteria for Buildings and Other Structures, chapter 20 (Eq. 20.4-1, Table 20.3-1).', 'ASCE/SEI 7-22, Minimum Design Loads and Associated Criteria for Buildings and Other Structures, chapter 20 (Table 20.2-1).', 'EN 1998-1:2004, Eurocode 8: Design of structures for earthquake resistance, Part 1, Section 3.1.2 (Eq. 3.1, Table 3.1).'] });
      if (options.extrapolated) out.push({ method: 'Extension of the deepest velocity to 30 m', purpose: 'Vs30 where the profile is shallower than 30 m', references: ['Boore, D. M. (2004). Estimating Vs(30) (or NEHRP site classes) from shallow velocity models (depths < 30 m). Bulletin of the Seismological Society of America 94, 591–597.'] });
      if (options.estimatedFromVp) out.push({ method: "Shear-wave velocity from P-wave velocity and Poisson's ratio", purpose: 'ESTIMATED shear-wave velocities (not measured)', references: [TELFORD] });
    } else if (stepIs(step, 'jointModel')) {
      out.push({ method: 'Time-term model of all shots together', purpose: 'one velocity per layer shared by every shot, a delay time per geophone and per source on each refractor, each pick assigned to the arrival the model predicts first; the number of refractors by the Hannan-Quinn information criterion with every delay time counted', references: ['Scheidegger, A. E. & Willmore, P. L. (1957). The use of a least squares method for the interpretation of data from seismic surveys. Geophysics 22, 9–22.', 'Willmore, P. L. & Bancroft, A. M. (1960). The time term approach to refraction seismology. Geophysical Journal of the Royal Astronomical Society 3, 419–432.', 'Paige, C. C. & Saunders, M. A. (1982). LSQR: an algorithm for sparse linear equations and sparse least squares. ACM Transactions on Mathematical Software 8, 43–71.', 'Hannan, E. J. & Quinn, B. G. (1979). The determination of the order of an autoregression. Journal of the Royal Statistical Society B 41, 190–195.'] });
    } else if (/time.?term/i.test(step.step)) {
      out.push({ method: 'Time-term method', purpose: step.step, references: ['Scheidegger, A. E. & Willmore, P. L. (1957). The use of a least squares method for the interpretation of data from seismic surveys. Geophysics 22, 9–22.'] });
    } else if (step.step === 'inversion') {
      out.push({ method: 'Layered-model inversion (damped least squares)', purpose: 'refractor depths and layer velocities refined until first arrivals computed through the section fit every pick', references: ['Levenberg, K. (1944). A method for the solution of certain non-linear problems in least squares. Quarterly of Applied Mathematics 2, 164–168.', 'Marquardt, D. W. (1963). An algorithm for least-squares estimation of nonlinear parameters. Journal of the Society for Industrial and Applied Mathematics 11, 431–441.'] });
    } else if (step.step === 'refractor_check') {
      out.push({ method: 'Check of the deepest refractor through the layered inversion', purpose: `the deepest refractor kept only where the section with it explains the picks better, for the unknowns it adds, than the section without it (Hannan-Quinn information criterion over both inverted sections)${parameter(step, 'needed') === false ? '; here the refractor was left out' : ''}${parameter(step, 'without_stopped_early') === true ? '; the inversion of the section without it was stopped once it stayed more than four times worse and gained under 3 % a step, which cannot change the outcome within the iteration limit' : ''}`, references: ['Hannan, E. J. & Quinn, B. G. (1979). The determination of the order of an autoregression. Journal of the Royal Statistical Society B 41, 190–195.'] });
    } else if (/invers/i.test(step.step)) {
      out.push({ method: 'Damped least-squares inversion of the layered model', purpose: step.step, references: ['Marquardt, D. W. (1963). An algorithm for least-squares estimation of nonlinear parameters. Journal of the Society for Industrial and Applied Mathematics 11, 431–441.'] });
    } else if (/tomo/i.test(step.step)) {
      out.push({ method: 'First-arrival traveltime tomography', purpose: step.step, references: ['Sethian, J. A. (1996). A fast marching level set method for monotonically advancing fronts. Proceedings of the National Academy of Sciences 93, 1591–1595.', 'Zelt, C. A. & Barton, P. J. (1998). Three-dimensional seismic refraction tomography: a comparison of two methods applied to data from the Faeroe Basin. Journal of Geophysical Research 103, 7187–7210.'] });
    } else {
      out.push({ method: step.step, purpose: 'as recorded in the processing history', references: [] });
    }
  }
  if (options.tomogram) {
    out.push({ method: 'First-arrival traveltime tomography (a second opinion beside the layered section)', purpose: 'velocity grid from the same first breaks: fast-marching first-arrival times, adjoint-state gradient, smoothing-regularised least squares by L-BFGS', references: [
      'Sethian, J. A. (1996). A fast marching level set method for monotonically advancing fronts. Proceedings of the National Academy of Sciences 93, 1591–1595.',
      'Leung, S. & Qian, J. (2006). An adjoint state method for three-dimensional transmission traveltime tomography using first-arrivals. Communications in Mathematical Sciences 4, 249–266.',
      'Zelt, C. A. & Barton, P. J. (1998). Three-dimensional seismic refraction tomography: a comparison of two methods applied to data from the Faeroe Basin. Journal of Geophysical Research 103, 7187–7210.',
      'Nocedal, J. (1980). Updating quasi-Newton matrices with limited storage. Mathematics of Computation 35, 773–782.',
    ] });
  }
  return out;
}
