/**
 * Verdict and findings for a hall-sensor capture, in plain words for a technician (what it means, what
 * usually causes it, what to check next).
 *
 * Thresholds (common practice; CONTRACT.md "Traces"):
 * - healthy quadrature: phase 90 +/- 30 electrical degrees (QUADRATURE_NOMINAL_DEG, QUADRATURE_TOLERANCE_DEG);
 * - glitch: a pulse shorter than 10% of the median pulse (measure.ts GLITCH_FRACTION);
 * - dropout: a period longer than 1.8x its local median period (measure.ts DROPOUT_PERIOD_RATIO), or
 *   shorter than 0.55x (a pulse broken by a brief loss of signal, DROPOUT_SHORT_PERIOD_RATIO);
 * - low amplitude: a high state under 60% of the sensor supply (LOW_AMPLITUDE_FRACTION); the supply is
 *   `supplyV` when given, else assumed from the higher of the two high states: 5 V below 6 V, else 12 V;
 * - channels shorted: the same waveform on both channels, i.e. a sample correlation above 0.95 with
 *   amplitudes (standard deviations) within a factor of 1.5 of each other. For two-level signals a
 *   correlation above 0.95 already means a phase under about 5 degrees; the phase itself is not used
 *   because a bridge of push-pull outputs gives three levels, on which the edge-based phase can mislead.
 *   The amplitude condition keeps a floating line that merely picks up crosstalk from being called a bridge;
 * - stuck: a channel whose levels are under 0.5 V apart, that is high or low for more than 97% of the
 *   capture, or that switches less than a quarter as often as the other channel (analyze.ts);
 * - informational, not verdicts: duty cycle outside 50 +/- 15% (duty_off), low state above 30% of the
 *   supply (low_level_raised), speed changing by 15% or more across the capture (speed_change).
 * Verdict precedence: channel_stuck, channels_shorted, low_amplitude, intermittent, phase_error, healthy.
 */
import type { Direction } from './phase';

/** Healthy quadrature phase, electrical degrees. */
export const QUADRATURE_NOMINAL_DEG = 90;
/** Allowed deviation from QUADRATURE_NOMINAL_DEG, degrees. */
export const QUADRATURE_TOLERANCE_DEG = 30;
/** A high state under this fraction of the sensor supply is low amplitude. */
export const LOW_AMPLITUDE_FRACTION = 0.6;
/** A low state above this fraction of the sensor supply is reported as raised (informational). */
export const LOW_LEVEL_RAISED_FRACTION = 0.3;
/** Channels correlating above this, with amplitudes within SHORTED_MAX_AMPLITUDE_RATIO, are shorted together. */
export const SHORTED_MIN_CORRELATION = 0.95;
export const SHORTED_MAX_AMPLITUDE_RATIO = 1.5;
/** Nominal duty cycle and the deviation beyond which duty_off is reported, percent. */
export const DUTY_NOMINAL_PCT = 50;
export const DUTY_TOLERANCE_PCT = 15;
/** Speed change across the capture (start vs end) that is reported, percent. */
export const SPEED_CHANGE_PCT = 15;
/** Below this high state (volts) a 5 V sensor supply is assumed, else 12 V. */
export const SUPPLY_GUESS_SPLIT_V = 6;

/** Overall classification (CONTRACT.md). */
export type Verdict =
  | 'healthy'
  | 'channels_shorted'
  | 'channel_stuck'
  | 'low_amplitude'
  | 'intermittent'
  | 'phase_error';

/** Verdicts in precedence order (first wins). */
export const VERDICT_PRECEDENCE: readonly Verdict[] = [
  'channel_stuck',
  'channels_shorted',
  'low_amplitude',
  'intermittent',
  'phase_error',
  'healthy',
];

/** Codes a finding can carry. */
export type FindingCode =
  | 'healthy'
  | 'channel_stuck'
  | 'channels_shorted'
  | 'low_amplitude'
  | 'glitches'
  | 'dropout'
  | 'phase_error'
  | 'duty_off'
  | 'low_level_raised'
  | 'speed_change';

/** One observation about the capture. */
export interface Finding {
  code: FindingCode;
  channel: 'a' | 'b' | null;
  /** The whole finding in plain words (meaning, usual cause, what to check next). */
  message: string;
  /** A short headline. */
  title: string;
  /** What the measurement means for the window. */
  meaning: string;
  /** What usually causes it (null when nothing is wrong). */
  cause: string | null;
  /** What to check next. */
  check: string;
}

/** What the verdict needs to know about one channel. */
export interface VerdictChannel {
  lowV: number;
  highV: number;
  freqHz: number;
  dutyPct: number;
  edges: number;
  glitches: number;
  dropouts: number;
  stuck: boolean;
  /** For a stuck channel: the level it rests at, volts. */
  restV: number;
}

/** Speed at the start and end of the capture. */
export interface SpeedTrend {
  startHz: number;
  endHz: number;
  /** (endHz - startHz) / startHz, percent; negative = slowing down. */
  changePct: number;
}

/** Input of computeVerdict. */
export interface VerdictInput {
  channels: { a: VerdictChannel; b: VerdictChannel };
  phaseDeg: number;
  direction: Direction;
  /** False when the phase could not be measured (a channel stuck, no paired cycles). */
  phaseMeasured: boolean;
  correlation: number;
  /** Standard deviation of B over that of A (1 for identical waveforms). */
  amplitudeRatio: number;
  supplyV: number;
  supplySource: 'given' | 'assumed';
  speedTrend: SpeedTrend | null;
}

/** True when two channels carry the same waveform (thresholds in the module comment). */
export function isBridged(correlation: number, amplitudeRatio: number): boolean {
  return (
    correlation > SHORTED_MIN_CORRELATION &&
    amplitudeRatio <= SHORTED_MAX_AMPLITUDE_RATIO &&
    amplitudeRatio >= 1 / SHORTED_MAX_AMPLITUDE_RATIO
  );
}

/** Verdict and the findings behind it (the verdict's own finding first). */
export interface VerdictResult {
  verdict: Verdict;
  findings: Finding[];
}

/** Sensor supply assumed from a high state when none is given: 5 V below 6 V, else 12 V. */
export function assumeSupplyV(highV: number): number {
  return highV < SUPPLY_GUESS_SPLIT_V ? 5 : 12;
}

const NAME = { a: 'A', b: 'B' } as const;
const v = (x: number): string => `${x.toFixed(2)} V`;
const pct = (x: number): string => `${x.toFixed(1)}%`;
const deg = (x: number): string => `${x.toFixed(1)}°`;

const BACK_PROBE =
  'back-probe the signal at the door harness connector (from the back of the connector, never by piercing the insulation: a pierced wire lets water in)';

/** The plain-words parts of a finding, before they are joined into its message. */
interface FindingParts {
  title: string;
  meaning: string;
  cause?: string;
  check: string;
}

/** A finding from its parts; the message reads "<meaning> Usual cause: <cause> Check next: <check>". */
function finding(code: FindingCode, channel: 'a' | 'b' | null, parts: FindingParts): Finding {
  const message = [parts.meaning, parts.cause ? `Usual cause: ${parts.cause}` : '', `Check next: ${parts.check}`].filter(Boolean).join(' ');
  return { code, channel, message, title: parts.title, meaning: parts.meaning, cause: parts.cause ?? null, check: parts.check };
}

/** Classify a capture from its measurements; thresholds and precedence in the module comment. */
export function computeVerdict(input: VerdictInput): VerdictResult {
  const { channels } = input;
  const keys = ['a', 'b'] as const;
  const primary: Finding[] = [];
  const secondary: Finding[] = [];
  const supplyNote =
    input.supplySource === 'assumed'
      ? ` (sensor supply assumed ${input.supplyV} V from the signal levels; give the supply voltage if it differs)`
      : '';

  const stuck = keys.filter((k) => channels[k].stuck);
  const live = keys.filter((k) => !channels[k].stuck);

  // 1. Stuck channels.
  if (stuck.length === 2) {
    primary.push(
      finding('channel_stuck', null, {
        title: 'Neither channel switches',
        meaning:
          `Neither channel switches: A rests at ${v(channels.a.restV)} and B at ${v(channels.b.restV)}. ` +
          'Without switching signals the door module cannot count position or tell direction.',
        cause: 'either the motor did not turn during the capture, or both sensors have lost their supply or ground (they share them).',
        check:
          `run the window while capturing; then check the sensor supply and ground at the door harness connector and ${BACK_PROBE}. ` +
          'If the supply and ground are good and neither line switches with the motor turning, inspect the connector and motor for water and corrosion and replace the motor/encoder.',
      }),
    );
  } else if (stuck.length === 1) {
    const k = stuck[0]!;
    const other = k === 'a' ? 'b' : 'a';
    const c = channels[k];
    const state = restState(c.restV, input.supplyV);
    const switches = c.edges > 0 ? ` (it switches only ${c.edges} times while ${NAME[other]} switches ${channels[other].edges} times)` : '';
    const cause =
      state === 'low'
        ? 'the line is held low: the signal wire is shorted to ground (chafed harness, water in the connector) or the sensor output is stuck on.'
        : state === 'high'
          ? 'the line is held high: the sensor has stopped switching (often a water-damaged encoder board), or the signal wire is open so only the pull-up is seen, or it is shorted to the supply.'
          : 'the line sits between the two states: a leakage path (water or corrosion between pins) or a failing sensor output is pulling it.';
    primary.push(
      finding('channel_stuck', k, {
        title: `Channel ${NAME[k]} does not switch`,
        meaning:
          `Channel ${NAME[k]} does not switch: it stays ${state === 'mid' ? '' : `${state} `}at ${v(c.restV)} while channel ${NAME[other]} switches normally${switches}. ` +
          'Without both channels the door module cannot count position or tell direction, so automatic travel and anti-pinch stop working.',
        cause,
        check:
          `${BACK_PROBE} while the motor runs; check the sensor supply and ground at the connector; ` +
          'with the motor unplugged, check the signal wire for continuity and for a short to ground or supply. If the wiring is sound, the encoder in the motor has failed: inspect it for water and replace the motor.',
      }),
    );
  }

  // 2. Channels shorted together (only meaningful when both switch).
  const shorted = live.length === 2 && isBridged(input.correlation, input.amplitudeRatio);
  if (shorted) {
    primary.push(
      finding('channels_shorted', null, {
        title: 'Channels A and B are shorted together',
        meaning:
          `Channels A and B carry the same waveform (correlation ${input.correlation.toFixed(3)}): the two signal lines are bridged. ` +
          'The encoder can no longer give direction or position, so automatic travel and anti-pinch stop working; spikes at the edges are the two sensor outputs fighting each other.',
        cause:
          'water or corrosion bridging the two signal pins in the door harness connector or on the encoder board, less often a chafed harness where the wires touch.',
        check:
          'unplug the motor and measure the resistance between the two signal pins on the harness side and on the motor side to find which side is bridged; inspect the connector for moisture and green corrosion; check the door membrane, seals and drain holes before fitting new parts.',
      }),
    );
  }

  if (!shorted) {
    for (const k of live) {
      const c = channels[k];
      // 3. Low amplitude.
      const limit = LOW_AMPLITUDE_FRACTION * input.supplyV;
      if (c.highV < limit) {
        primary.push(
          finding('low_amplitude', k, {
            title: `Channel ${NAME[k]}'s high level is weak`,
            meaning:
              `Channel ${NAME[k]}'s high state is only ${v(c.highV)}, under 60% of the ${input.supplyV} V sensor supply (${v(limit)})${supplyNote}. ` +
              'The line cannot pull up fully, so the door module may miss or misread pulses.',
            cause:
              'a leakage path to ground from water or corrosion in the connector or on the encoder board, a high-resistance pin, or a weak sensor supply.',
            check: `measure the sensor supply at the connector with the motor running; ${BACK_PROBE} — a poor probe contact can itself read low; inspect the pins for corrosion. If the supply is good and the level stays low, the encoder is failing.`,
          }),
        );
      }
      // 4. Intermittent: glitches and dropouts.
      if (c.glitches > 0) {
        primary.push(
          finding('glitches', k, {
            title: `Glitches on channel ${NAME[k]}`,
            meaning:
              `Channel ${NAME[k]} has ${c.glitches} glitch${c.glitches === 1 ? '' : 'es'}: pulses shorter than 10% of the normal pulse. ` +
              'The module counts them as extra pulses, which upsets the stored window position and can cause false anti-pinch reversals.',
            cause:
              'an intermittent contact (corroded, loose or fretted connector pin), a cracked solder joint on the encoder board, moisture, or interference coupling into the harness.',
            check:
              'wiggle the harness and connector while watching the signal; inspect the pins for corrosion and the terminals for spread; make sure the scope ground is on the sensor ground at the connector.',
          }),
        );
      }
      if (c.dropouts > 0) {
        primary.push(
          finding('dropout', k, {
            title: `Missing pulses on channel ${NAME[k]}`,
            meaning:
              `Channel ${NAME[k]} has ${c.dropouts} dropout${c.dropouts === 1 ? '' : 's'}: missing or broken pulses (a period more than 1.8 times as long as its neighbours, or a pulse cut short). ` +
              'The module loses count, so the window may stop, run short, or lose its automatic mode.',
            cause:
              'an intermittent open in the signal or supply wire (often where the harness flexes between door and body), corroded pins, or water in the motor.',
            check:
              'flex the door harness at the hinge while capturing; check the sensor supply for dips; if both channels drop out at the same moments, suspect the shared supply or ground.',
          }),
        );
      }
    }
    // 5. Phase error.
    if (live.length === 2 && input.phaseMeasured) {
      const off = Math.abs(input.phaseDeg - QUADRATURE_NOMINAL_DEG);
      if (off > QUADRATURE_TOLERANCE_DEG) {
        primary.push(
          finding('phase_error', null, {
            title: 'The channels are not a quarter period apart',
            meaning:
              `The channels are ${deg(input.phaseDeg)} apart; a healthy encoder gives ${QUADRATURE_NOMINAL_DEG}° ± ${QUADRATURE_TOLERANCE_DEG}° (a quarter period). ` +
              'The door module may misjudge direction or miscount, which shows as a window that stops, reverses, or will not learn its end positions.',
            cause:
              "one channel's edges are shifted by a weak or distorted signal (moisture or corrosion on the encoder board), or the sensor board or magnet ring has moved or is damaged.",
            check:
              "compare the two channels' levels and duty cycles in this capture; repeat the capture with the motor running steadily in both directions; if the phase stays wrong with clean levels, replace the motor/encoder.",
          }),
        );
      }
    }
    // Informational: duty cycle and raised low level.
    for (const k of live) {
      const c = channels[k];
      if (Number.isFinite(c.dutyPct) && Math.abs(c.dutyPct - DUTY_NOMINAL_PCT) > DUTY_TOLERANCE_PCT) {
        secondary.push(
          finding('duty_off', k, {
            title: `Channel ${NAME[k]}'s duty cycle is off`,
            meaning:
              `Channel ${NAME[k]}'s duty cycle is ${pct(c.dutyPct)}; the encoder's nominal is about 50%. ` +
              'High and low times are unequal, which shifts where the module sees the edges.',
            cause:
              'a sagging high or raised low level moving the switching point (leakage from water), a damaged or partly demagnetised magnet ring, or a shifted sensor.',
            check: "look at this channel's levels; compare with the other channel; if the levels are clean, suspect the encoder itself.",
          }),
        );
      }
      const raised = LOW_LEVEL_RAISED_FRACTION * input.supplyV;
      if (c.lowV > raised) {
        secondary.push(
          finding('low_level_raised', k, {
            title: `Channel ${NAME[k]}'s low level is raised`,
            meaning:
              `Channel ${NAME[k]}'s low state is ${v(c.lowV)}, above 30% of the ${input.supplyV} V supply (${v(raised)})${supplyNote}. ` +
              'The sensor cannot pull the line fully low, so the module may not see every low state.',
            cause: 'resistance in the sensor ground (corroded ground pin or splice), or leakage from the supply side through water.',
            check: 'measure the voltage drop on the sensor ground with the motor running; inspect the ground pin and splices for corrosion.',
          }),
        );
      }
    }
  }

  if (input.speedTrend && Math.abs(input.speedTrend.changePct) >= SPEED_CHANGE_PCT) {
    const s = input.speedTrend;
    const slowing = s.changePct < 0;
    secondary.push(
      slowing
        ? finding('speed_change', null, {
            title: 'The motor slows across the capture',
            meaning:
              `The motor slows by ${pct(-s.changePct)} across the capture (${s.startHz.toFixed(1)} Hz to ${s.endHz.toFixed(1)} Hz). ` +
              'A rising load slows the motor; this is what the anti-pinch function watches for, so a window that reverses by itself is often meeting drag, not an obstruction.',
            cause:
              'the glass reaching the seal at the end of travel (normal), a stiff or dirty glass run channel, a binding regulator, or low supply voltage under load.',
            check:
              'note where in the travel the slowing happens; check the glass run channel and regulator for drag and the motor supply under load; after repair re-initialise the window and verify that automatic closing reverses on an obstruction.',
          })
        : finding('speed_change', null, {
            title: 'The motor speeds up across the capture',
            meaning:
              `The motor speeds up by ${pct(s.changePct)} across the capture (${s.startHz.toFixed(1)} Hz to ${s.endHz.toFixed(1)} Hz). ` +
              'The capture probably started while the motor was still starting, or the load dropped during travel.',
            check:
              'capture again with the motor already running for a steady reading; if the speed jumps during travel, check the regulator and glass run channel for a tight spot.',
          }),
    );
  }

  const order = (f: Finding): number => {
    const verdictOf = f.code === 'glitches' || f.code === 'dropout' ? 'intermittent' : (f.code as Verdict);
    return VERDICT_PRECEDENCE.indexOf(verdictOf);
  };
  primary.sort((x, y) => order(x) - order(y));
  const first = primary[0];
  const verdict: Verdict = first === undefined ? 'healthy' : first.code === 'glitches' || first.code === 'dropout' ? 'intermittent' : (first.code as Verdict);
  if (verdict === 'healthy') {
    primary.push(
      finding('healthy', null, {
        title: 'The encoder signals look healthy',
        meaning:
          `Both channels switch cleanly between steady levels, ${deg(input.phaseDeg)} apart (healthy: ${QUADRATURE_NOMINAL_DEG}° ± ${QUADRATURE_TOLERANCE_DEG}°), with no glitches or missing pulses. ` +
          'The encoder signals look healthy at the harness.',
        check:
          'if the window still misbehaves, look at the regulator, glass run channel and the door module; after any window work re-initialise the window and verify that automatic closing reverses on an obstruction.',
      }),
    );
  }
  return { verdict, findings: [...primary, ...secondary] };
}

/** Where a stuck channel rests relative to the supply. */
function restState(restV: number, supplyV: number): 'low' | 'high' | 'mid' {
  if (restV < 0.25 * supplyV) return 'low';
  if (restV > 0.7 * supplyV) return 'high';
  return 'mid';
}
