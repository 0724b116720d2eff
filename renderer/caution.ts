/** The caution every view, export and report carries (the README states the same). One source here. */
export const CAUTION_TITLE = 'For preliminary design and trade studies only';
export const CAUTION_TEXT =
  'Landreach is not flight software. Verify every result with high-fidelity simulation and your ' +
  "organisation's assurance process before it informs a decision.";
/** One line for caption stamps on exported figures. */
export const CAUTION_LINE = 'Preliminary design and trade studies only - not flight software - verify with high-fidelity simulation.';
