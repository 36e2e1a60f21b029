/** Display labels and badge styles for the product's enumerations. */
export const STATUS_LABELS: Record<string, string> = {
  reported: 'Reported',
  diagnosing: 'Diagnosing',
  awaiting_parts: 'Awaiting parts',
  repaired: 'Repaired',
  verified: 'Verified',
  closed: 'Closed',
  cancelled: 'Cancelled',
};
export const STATUS_BADGE: Record<string, string> = {
  reported: 'badge-amber',
  diagnosing: 'badge-seep',
  awaiting_parts: 'badge-amber',
  repaired: 'badge-brand',
  verified: 'badge-moss',
  closed: 'badge-neutral',
  cancelled: 'badge-neutral',
};
export const POSITION_LABELS: Record<string, string> = {
  FL: 'Front left',
  FR: 'Front right',
  RL: 'Rear left',
  RR: 'Rear right',
  SL: 'Sliding left',
  SR: 'Sliding right',
  TG: 'Tailgate / rear doors',
};
export const MOISTURE_LABELS: Record<string, string> = {
  none: 'None found',
  traces: 'Traces',
  corrosion: 'Corrosion',
  standing_water: 'Standing water',
};
export const ROOT_CAUSE_LABELS: Record<string, string> = {
  water_ingress: 'Water ingress',
  connector: 'Connector',
  wiring: 'Wiring',
  mechanical: 'Mechanical',
  sensor: 'Sensor',
  software: 'Software',
  unknown: 'Unknown',
};
export const FUNCTION_LABELS: Record<string, string> = {
  window_lifter: 'Window lifter',
  lock_actuator: 'Lock actuator',
  door_control: 'Door control module',
  mirror: 'Mirror',
  harness: 'Harness',
  switch: 'Switch',
  other: 'Other',
};
export const PARKING_LABELS: Record<string, string> = { indoor: 'Indoor', outdoor: 'Outdoor', mixed: 'Mixed' };
