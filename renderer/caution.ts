/** The caution every view, export and report carries (the README states the same). One source here. */
export const CAUTION_TITLE = 'For preliminary design and trade studies only';
export const CAUTION_TEXT =
  'Landreach is not flight software. Verify every result with high-fidelity simulation and your ' +
  "organisation's assurance process before it informs a decision.";
/** One line for caption stamps on exported figures: the same sentence as every core export. */
export { CAUTION as CAUTION_LINE } from '../core/study/provenance.ts';
