import { describe, it, expect } from 'vitest';
import { assumeSupplyV, computeVerdict, type VerdictChannel, type VerdictInput } from './verdict';

const healthyChannel = (over: Partial<VerdictChannel> = {}): VerdictChannel => ({
  lowV: 0.2,
  highV: 4.9,
  freqHz: 200,
  dutyPct: 50,
  edges: 80,
  glitches: 0,
  dropouts: 0,
  stuck: false,
  restV: 0.2,
  ...over,
});

const input = (over: Partial<VerdictInput> = {}, a: Partial<VerdictChannel> = {}, b: Partial<VerdictChannel> = {}): VerdictInput => ({
  channels: { a: healthyChannel(a), b: healthyChannel(b) },
  phaseDeg: 90,
  direction: 'a_leads',
  phaseMeasured: true,
  correlation: 0,
  amplitudeRatio: 1,
  supplyV: 5,
  supplySource: 'assumed',
  speedTrend: null,
  ...over,
});

const codes = (r: ReturnType<typeof computeVerdict>): string[] => r.findings.map((f) => `${f.code}:${f.channel ?? '-'}`);

describe('computeVerdict precedence (channel_stuck, channels_shorted, low_amplitude, intermittent, phase_error, healthy)', () => {
  it('healthy with one plain-words healthy finding', () => {
    const r = computeVerdict(input());
    expect(r.verdict).toBe('healthy');
    expect(codes(r)).toEqual(['healthy:-']);
    expect(r.findings[0]!.message).toMatch(/anti-pinch|reverses on an obstruction/);
  });

  it('phase_error outside 90 +/- 30 degrees', () => {
    expect(computeVerdict(input({ phaseDeg: 59 })).verdict).toBe('phase_error');
    expect(computeVerdict(input({ phaseDeg: 121 })).verdict).toBe('phase_error');
    expect(computeVerdict(input({ phaseDeg: 61 })).verdict).toBe('healthy');
    expect(computeVerdict(input({ phaseDeg: 119 })).verdict).toBe('healthy');
  });

  it('intermittent (glitches, dropouts) beats phase_error', () => {
    const g = computeVerdict(input({ phaseDeg: 150 }, { glitches: 2 }));
    expect(g.verdict).toBe('intermittent');
    expect(codes(g)).toEqual(['glitches:a', 'phase_error:-']);
    const d = computeVerdict(input({ phaseDeg: 150 }, {}, { dropouts: 1 }));
    expect(d.verdict).toBe('intermittent');
    expect(codes(d)).toEqual(['dropout:b', 'phase_error:-']);
  });

  it('low_amplitude (high state under 60% of the supply) beats intermittent', () => {
    const r = computeVerdict(input({ phaseDeg: 150 }, { glitches: 2 }, { highV: 2.99 }));
    expect(r.verdict).toBe('low_amplitude');
    expect(codes(r)).toEqual(['low_amplitude:b', 'glitches:a', 'phase_error:-']);
    expect(computeVerdict(input({}, {}, { highV: 3.01 })).verdict).toBe('healthy');
    expect(computeVerdict(input({ supplyV: 12, supplySource: 'given' }, { highV: 11.8 }, { highV: 7.1 })).verdict).toBe('low_amplitude');
    expect(computeVerdict(input({ supplyV: 12, supplySource: 'given' }, { highV: 11.8 }, { highV: 7.3 })).verdict).toBe('healthy');
  });

  it('channels_shorted (correlation > 0.95, amplitudes within 1.5x) beats low_amplitude and hides its artefacts', () => {
    const r = computeVerdict(input({ correlation: 0.99, phaseDeg: 1, direction: 'none' }, { highV: 2, glitches: 3, dutyPct: 25 }, { highV: 2, dutyPct: 25 }));
    expect(r.verdict).toBe('channels_shorted');
    expect(codes(r)).toEqual(['channels_shorted:-']);
    expect(computeVerdict(input({ correlation: 0.94, phaseDeg: 1 })).verdict).toBe('phase_error');
    // A three-level bridge can mislead the edge-based phase: correlation and amplitude decide.
    expect(computeVerdict(input({ correlation: 0.99, phaseDeg: 79 })).verdict).toBe('channels_shorted');
    // A floating line that only picks up crosstalk (a tenth of the amplitude) is not a bridge.
    expect(computeVerdict(input({ correlation: 0.99, phaseDeg: 1, amplitudeRatio: 0.1 })).verdict).toBe('phase_error');
    expect(computeVerdict(input({ correlation: 0.99, phaseDeg: 1, amplitudeRatio: 1.6 })).verdict).toBe('phase_error');
  });

  it('channel_stuck beats everything and names the channel', () => {
    const r = computeVerdict(
      input({ correlation: 0.99, phaseDeg: 0, phaseMeasured: false }, { highV: 2, glitches: 3 }, { stuck: true, restV: 4.95, lowV: 4.95, highV: 4.95, freqHz: 0, dutyPct: 100, edges: 0 }),
    );
    expect(r.verdict).toBe('channel_stuck');
    expect(codes(r)).toEqual(['channel_stuck:b', 'low_amplitude:a', 'glitches:a']);
    expect(r.findings[0]!.message).toMatch(/Channel B does not switch: it stays high at 4\.95 V/);
  });

  it('both channels stuck: one finding without a channel, asking whether the motor ran', () => {
    const stuck = { stuck: true, freqHz: 0, dutyPct: 0, edges: 0, restV: 0.1, lowV: 0.1, highV: 0.1 };
    const r = computeVerdict(input({ phaseMeasured: false, phaseDeg: 0 }, stuck, stuck));
    expect(r.verdict).toBe('channel_stuck');
    expect(codes(r)).toEqual(['channel_stuck:-']);
    expect(r.findings[0]!.message).toMatch(/motor did not turn/);
  });
});

describe('computeVerdict messages for technicians', () => {
  it('low amplitude says what it means, the usual cause, and to back-probe rather than pierce the insulation', () => {
    const m = computeVerdict(input({}, {}, { highV: 2.4 })).findings[0]!.message;
    expect(m).toContain('2.40 V');
    expect(m).toContain('3.00 V');
    expect(m).toMatch(/leakage/);
    expect(m).toMatch(/back-probe/);
    expect(m).toMatch(/never by piercing the insulation/);
    expect(m).toMatch(/supply assumed 5 V/);
    const given = computeVerdict(input({ supplySource: 'given' }, {}, { highV: 2.4 })).findings[0]!.message;
    expect(given).not.toMatch(/assumed/);
  });

  it('stuck low and stuck mid-level explain different causes', () => {
    const low = computeVerdict(input({ phaseMeasured: false }, { stuck: true, restV: 0.05 })).findings[0]!.message;
    expect(low).toMatch(/stays low at 0\.05 V/);
    expect(low).toMatch(/shorted to ground/);
    const mid = computeVerdict(input({ phaseMeasured: false }, { stuck: true, restV: 2.3 })).findings[0]!.message;
    expect(mid).toMatch(/stays at 2\.30 V/);
    expect(mid).toMatch(/leakage path/);
  });

  it('reports duty_off, low_level_raised and speed_change as extra findings without changing the verdict', () => {
    const r = computeVerdict(
      input({ speedTrend: { startHz: 200, endHz: 150, changePct: -25 } }, { dutyPct: 30 }, { lowV: 1.8 }),
    );
    expect(r.verdict).toBe('healthy');
    expect(codes(r)).toEqual(['healthy:-', 'duty_off:a', 'low_level_raised:b', 'speed_change:-']);
    const speed = r.findings.find((f) => f.code === 'speed_change')!.message;
    expect(speed).toMatch(/slows by 25\.0%/);
    expect(speed).toMatch(/anti-pinch/);
  });

  it('does not report a speed change under 15%', () => {
    const r = computeVerdict(input({ speedTrend: { startHz: 200, endHz: 172, changePct: -14 } }));
    expect(codes(r)).toEqual(['healthy:-']);
  });

  it('every finding carries a message of at least three sentences', () => {
    const r = computeVerdict(
      input({ phaseDeg: 150, speedTrend: { startHz: 100, endHz: 130, changePct: 30 } }, { glitches: 1, dutyPct: 20 }, { dropouts: 2, highV: 2, lowV: 1.7 }),
    );
    expect(r.findings.length).toBe(7);
    for (const f of r.findings) expect(f.message.split('. ').length).toBeGreaterThanOrEqual(3);
  });
});

describe('computeVerdict finding parts', () => {
  it('gives every finding a title, what it means, its usual cause and what to check next, joined into the message', () => {
    const r = computeVerdict(
      input({ phaseDeg: 150, speedTrend: { startHz: 200, endHz: 150, changePct: -25 } }, { glitches: 1, dutyPct: 20 }, { dropouts: 2, highV: 2, lowV: 1.7 }),
    );
    for (const f of r.findings) {
      expect(f.title.length).toBeGreaterThan(10);
      expect(f.cause).not.toBeNull();
      expect(f.message).toBe(`${f.meaning} Usual cause: ${f.cause} Check next: ${f.check}`);
    }
    expect(r.findings.find((f) => f.code === 'glitches')!.title).toBe('Glitches on channel A');
  });

  it('a healthy capture has no cause, only what to check if the window still misbehaves', () => {
    const f = computeVerdict(input()).findings[0]!;
    expect(f.cause).toBeNull();
    expect(f.message).toBe(`${f.meaning} Check next: ${f.check}`);
  });
});

describe('assumeSupplyV', () => {
  it('assumes 5 V below a 6 V high state and 12 V from 6 V up', () => {
    expect(assumeSupplyV(4.9)).toBe(5);
    expect(assumeSupplyV(5.99)).toBe(5);
    expect(assumeSupplyV(6)).toBe(12);
    expect(assumeSupplyV(11.8)).toBe(12);
  });
});
