/** The cautions every screen and export carries (design.md section 6). One text, used everywhere. */
export const SCREENING_CAUTION =
  'Screening estimate, not a design. Foundation and heat-pump design on permafrost needs site investigation, ' +
  'local codes and licensed engineers.';

export const GROUND_CAUTIONS = [
  'Cooling unfrozen frost-susceptible soil can cause frost heave and jack piles upward.',
  'Heat extraction changes ground temperature and so adfreeze strength and pile capacity over time.',
];

export const FICTIONAL_DATA_NOTICE =
  'Demo data: the region, its grids and its settlements are invented and do not describe any real place.';
