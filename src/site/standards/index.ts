export { ASCE_7_16 } from './asce7-16.js';
export { ASCE_7_22 } from './asce7-22.js';
export { EN_1998_1_2004, groundTypeE } from './en1998-1-2004.js';
export { classify, type ClassBand, type SiteClassStandard } from './types.js';
