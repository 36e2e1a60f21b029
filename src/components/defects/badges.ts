/** Badge classes of the Defects view beyond the shared ones in src/components/labels.ts. */

/** Moisture found: any water evidence in seep blue, none in grey. */
export const MOISTURE_BADGE: Record<string, string> = {
  none: 'badge-neutral',
  traces: 'badge-seep',
  corrosion: 'badge-seep',
  standing_water: 'badge-seep',
};

/** Short door labels for tight cells ("Front L"); the long form is POSITION_LABELS. */
export const POSITION_SHORT: Record<string, string> = {
  FL: 'Front L',
  FR: 'Front R',
  RL: 'Rear L',
  RR: 'Rear R',
  SL: 'Slide L',
  SR: 'Slide R',
  TG: 'Tailgate',
};
