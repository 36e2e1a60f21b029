import { describe, it, expect } from 'vitest';
import { analyzeCapture, type TraceAnalysis } from './analyze';
import { CaptureError } from './capture-parse';
import { generateCapture, type GenerateSpec } from './generate';

/** 200 Hz, 100 kS/s, 0.2 s (40 periods), 5 V, noise 50 mV unless overridden. */
const gen = (over: Partial<GenerateSpec> = {}) =>
  generateCapture({ sampleRateHz: 100_000, samples: 20_000, freqHz: 200, noiseV: 0.05, seed: 5, ...over });

const codes = (r: TraceAnalysis): string[] => r.findings.map((f) => `${f.code}:${f.channel ?? '-'}`);

describe('analyzeCapture: healthy captures of known parameters', () => {
  // Tolerances: frequency 0.3%, duty 0.7 points, phase 1.5 degrees, levels 0.06 V (tighter than the
  // acceptance limits of 1%, 1.5 points and 3 degrees).
  const cases: Array<{ name: string; spec: Partial<GenerateSpec>; phase: number; dir: 'a_leads' | 'b_leads' }> = [
    { name: '5 V, 200 Hz, 90 deg A leads, 100 kS/s', spec: {}, phase: 90, dir: 'a_leads' },
    { name: '5 V, 200 Hz, B leads by 90 deg', spec: { phaseDeg: -90 }, phase: 90, dir: 'b_leads' },
    { name: '5 V, 1.2 kHz, 45% duty, 70 deg, 1 MS/s', spec: { sampleRateHz: 1_000_000, samples: 40_000, freqHz: 1200, dutyPct: 45, phaseDeg: 70 }, phase: 70, dir: 'a_leads' },
    { name: '12 V, 90 Hz, 55% duty, B leads 110 deg, 20 kS/s, noise 150 mV', spec: { sampleRateHz: 20_000, samples: 8_000, freqHz: 90, dutyPct: 55, phaseDeg: -110, lowV: 0.4, highV: 12, noiseV: 0.15 }, phase: 110, dir: 'b_leads' },
    { name: '12 V, 333 Hz, ideal steps at 10 kS/s (30 samples a period)', spec: { sampleRateHz: 10_000, samples: 3_000, freqHz: 333, riseS: 0, lowV: 0.3, highV: 11.6, noiseV: 0.1 }, phase: 90, dir: 'a_leads' },
    { name: '5 V, noise 5% of the swing (0.24 V), 400 Hz, 200 kS/s', spec: { sampleRateHz: 200_000, samples: 40_000, freqHz: 400, noiseV: 0.24, seed: 9 }, phase: 90, dir: 'a_leads' },
    { name: '5 V, starting at t = -10 ms (pre-trigger)', spec: { startS: -0.01, startCycle: 0.77 }, phase: 90, dir: 'a_leads' },
  ];
  for (const c of cases) {
    it(c.name, () => {
      const g = gen(c.spec);
      const r = analyzeCapture(g);
      const spec = { ...{ freqHz: 200, dutyPct: 50, lowV: 0.2, highV: 5 }, ...c.spec };
      expect(r.verdict).toBe('healthy');
      expect(r.direction).toBe(c.dir);
      expect(Math.abs(r.phaseDeg - c.phase)).toBeLessThan(1.5);
      for (const ch of [r.channels.a, r.channels.b]) {
        expect(Math.abs(ch.freqHz / spec.freqHz - 1)).toBeLessThan(0.003);
        expect(Math.abs(ch.dutyPct - spec.dutyPct)).toBeLessThan(0.7);
        expect(Math.abs(ch.lowV - spec.lowV)).toBeLessThan(0.06);
        expect(Math.abs(ch.highV - spec.highV)).toBeLessThan(0.06);
        expect(ch.glitches).toBe(0);
        expect(ch.stuck).toBe(false);
      }
      expect(r.samples).toBe(g.time.length);
      expect(r.sampleRateHz).toBeCloseTo(g.sampleRateHz, 0);
      expect(Math.abs(r.correlation)).toBeLessThan(0.95);
      expect(codes(r)[0]).toBe('healthy:-');
    });
  }

  it('counts 2 edges per period per channel and decodes +4 counts per period when A leads', () => {
    const r = analyzeCapture(gen({ startCycle: 0.3 }));
    expect(r.channels.a.edges).toBe(80);
    expect(r.channels.b.edges).toBe(80);
    expect(r.quadrature.invalidTransitions).toBe(0);
    expect(r.quadrature.count).toBe(160);
    expect(analyzeCapture(gen({ phaseDeg: -90, startCycle: 0.3 })).quadrature.count).toBe(-160);
  });

  it('gives rpm from the frequency and pulses per revolution (200 Hz, 2 per rev = 6000 rpm +/- 0.3%)', () => {
    const r = analyzeCapture(gen(), { pulsesPerRev: 2 });
    expect(Math.abs(r.rpm! / 6000 - 1)).toBeLessThan(0.003);
    expect(analyzeCapture(gen()).rpm).toBeNull();
  });

  it('has exactly the CONTRACT.md fields plus the documented extras', () => {
    const r = analyzeCapture(gen());
    expect(Object.keys(r).sort()).toEqual(
      ['samples', 'sampleRateHz', 'channels', 'phaseDeg', 'direction', 'correlation', 'verdict', 'findings', 'durationS', 'rpm', 'speedTrend', 'quadrature', 'supplyV', 'supplySource', 'thresholds'].sort(),
    );
    for (const key of ['lowV', 'highV', 'freqHz', 'dutyPct', 'edges', 'glitches']) {
      expect(typeof (r.channels.a as unknown as Record<string, unknown>)[key]).toBe('number');
    }
    expect(r.thresholds).toMatchObject({ quadratureNominalDeg: 90, quadratureToleranceDeg: 30, glitchFraction: 0.1, lowAmplitudeFraction: 0.6, lowAmplitudeHighV: 3, shortedMinCorrelation: 0.95 });
    expect(JSON.parse(JSON.stringify(r))).toEqual(r);
  });
});

describe('analyzeCapture: every verdict from a generated fault', () => {
  it('channels_shorted: wired-AND bridge (both low when either pulls low) with spikes at the edges', () => {
    const r = analyzeCapture(gen({ bridged: 'wired-and' }));
    expect(r.verdict).toBe('channels_shorted');
    expect(r.correlation).toBeGreaterThan(0.95);
    expect(r.phaseDeg).toBeLessThan(5);
    expect(r.direction).toBe('none');
    expect(codes(r)).toEqual(['channels_shorted:-']);
    expect(r.quadrature.invalidTransitions).toBeGreaterThan(0);
  });

  it('channels_shorted: push-pull outputs fighting (middle level while they disagree)', () => {
    const r = analyzeCapture(gen({ bridged: 'average' }));
    expect(r.verdict).toBe('channels_shorted');
    expect(r.channels.a.stuck).toBe(false);
  });

  it('channels_shorted: fighting outputs at 79 degrees and 54% duty (three levels; same levels used for both)', () => {
    const r = analyzeCapture(gen({ phaseDeg: -79, dutyPct: 54, bridged: 'average', seed: 65 }));
    expect(r.verdict).toBe('channels_shorted');
    expect(r.channels.a.lowV).toBe(r.channels.b.lowV);
    expect(r.phaseDeg).toBeLessThan(5);
  });

  it('channel_stuck, not shorted: a floating B that only picks up crosstalk from A (a tenth of the swing)', () => {
    const g = gen({ noiseV: 0.01 });
    for (let i = 0; i < g.b.length; i++) g.b[i] = 1 + 0.1 * (g.a[i]! - 2.6);
    const r = analyzeCapture(g);
    expect(r.correlation).toBeGreaterThan(0.95);
    expect(r.verdict).toBe('channel_stuck');
    expect(codes(r)[0]).toBe('channel_stuck:b');
  });

  it('channel_stuck: B stuck high, A switching (freq 0, duty 100 for B)', () => {
    const r = analyzeCapture(gen({ b: { stuck: 'high' } }));
    expect(r.verdict).toBe('channel_stuck');
    expect(codes(r)[0]).toBe('channel_stuck:b');
    expect(r.channels.b).toMatchObject({ stuck: true, freqHz: 0, dutyPct: 100, glitches: 0 });
    expect(r.channels.b.lowV).toBe(r.channels.b.highV);
    expect(Math.abs(r.channels.b.highV - 5)).toBeLessThan(0.05);
    expect(r.phaseDeg).toBe(0);
    expect(r.direction).toBe('none');
    expect(Math.abs(r.channels.a.freqHz / 200 - 1)).toBeLessThan(0.003);
  });

  it('channel_stuck: A stuck low (duty 0) and A stuck at a middle level', () => {
    const low = analyzeCapture(gen({ a: { stuck: 'low' } }));
    expect(low.verdict).toBe('channel_stuck');
    expect(low.channels.a).toMatchObject({ stuck: true, freqHz: 0, dutyPct: 0 });
    const mid = analyzeCapture(gen({ a: { stuck: 2.4 } }));
    expect(mid.verdict).toBe('channel_stuck');
    expect(mid.findings[0]!.message).toMatch(/stays at 2\.4\d V/);
  });

  it('channel_stuck: both channels flat (motor not turning)', () => {
    const r = analyzeCapture(gen({ a: { stuck: 'low' }, b: { stuck: 'high' } }));
    expect(r.verdict).toBe('channel_stuck');
    expect(codes(r)).toEqual(['channel_stuck:-']);
    expect(r.channels.a.dutyPct).toBe(0);
    expect(r.channels.b.dutyPct).toBe(100);
    expect(r.rpm).toBeNull();
  });

  it('channel_stuck: a flat channel with a few spikes (high 99% of the time)', () => {
    const g = gen({ b: { stuck: 'high' } });
    for (const i of [3000, 9000, 15000]) for (let j = 0; j < 20; j++) g.b[i + j] = 0.2;
    const r = analyzeCapture(g);
    expect(r.verdict).toBe('channel_stuck');
    expect(r.channels.b.stuck).toBe(true);
  });

  it('channel_stuck: a channel switching under a quarter as often as the other', () => {
    const g = gen();
    for (let i = 2500; i < g.b.length; i++) g.b[i] = 0.2; // B dies after 5 periods of 40
    const r = analyzeCapture(g);
    expect(r.verdict).toBe('channel_stuck');
    expect(r.channels.b.stuck).toBe(true);
    expect(r.channels.b.edges).toBeGreaterThan(0);
  });

  it('low_amplitude: weak 2.4 V high on a 5 V sensor (supply assumed)', () => {
    const r = analyzeCapture(gen({ b: { highV: 2.4 } }));
    expect(r.verdict).toBe('low_amplitude');
    expect(codes(r)[0]).toBe('low_amplitude:b');
    expect(r.supplyV).toBe(5);
    expect(r.supplySource).toBe('assumed');
    expect(Math.abs(r.channels.b.highV - 2.4)).toBeLessThan(0.05);
    expect(r.direction).toBe('a_leads');
  });

  it('low_amplitude: 6.5 V high on a 12 V system (supply assumed 12 V from channel A)', () => {
    const r = analyzeCapture(gen({ lowV: 0.3, highV: 12, noiseV: 0.1, b: { highV: 6.5 } }));
    expect(r.verdict).toBe('low_amplitude');
    expect(r.supplyV).toBe(12);
  });

  it('low_amplitude: a 5 V signal when the given supply is 12 V; healthy with supplyV 5', () => {
    expect(analyzeCapture(gen(), { supplyV: 12 }).verdict).toBe('low_amplitude');
    const r = analyzeCapture(gen(), { supplyV: 5 });
    expect(r.verdict).toBe('healthy');
    expect(r.supplySource).toBe('given');
  });

  it('intermittent: 3 glitches on A are counted and do not move the frequency', () => {
    const r = analyzeCapture(gen({ a: { glitches: 3 } }));
    expect(r.verdict).toBe('intermittent');
    expect(r.channels.a.glitches).toBe(3);
    expect(r.channels.a.edges).toBe(86);
    expect(codes(r)).toEqual(['glitches:a']);
    expect(Math.abs(r.channels.a.freqHz / 200 - 1)).toBeLessThan(0.003);
    expect(Math.abs(r.phaseDeg - 90)).toBeLessThan(1.5);
  });

  it('intermittent: 2 dropouts (missing pulses) on B', () => {
    const r = analyzeCapture(gen({ b: { dropouts: 2 } }));
    expect(r.verdict).toBe('intermittent');
    expect(r.channels.b.dropouts).toBe(2);
    expect(codes(r)).toEqual(['dropout:b']);
    expect(Math.abs(r.channels.b.freqHz / 200 - 1)).toBeLessThan(0.003);
    expect(Math.abs(r.channels.b.dutyPct - 50)).toBeLessThan(0.7);
  });

  it('intermittent: B goes quiet for the last 35% while A keeps switching (dropout at the end)', () => {
    const g = gen();
    for (let i = 13_000; i < g.b.length; i++) g.b[i] = 0.2;
    const r = analyzeCapture(g);
    expect(r.verdict).toBe('intermittent');
    expect(r.channels.b.dropouts).toBe(1);
  });

  it('phase_error: 150 degrees (A leads) and 30 degrees with B leading', () => {
    const wide = analyzeCapture(gen({ phaseDeg: 150 }));
    expect(wide.verdict).toBe('phase_error');
    expect(wide.direction).toBe('a_leads');
    expect(Math.abs(wide.phaseDeg - 150)).toBeLessThan(1.5);
    const narrow = analyzeCapture(gen({ phaseDeg: -30 }));
    expect(narrow.verdict).toBe('phase_error');
    expect(narrow.direction).toBe('b_leads');
    expect(Math.abs(narrow.phaseDeg - 30)).toBeLessThan(1.5);
  });

  it('phase exactly at the tolerance edges: 62 degrees healthy, 125 degrees phase_error', () => {
    expect(analyzeCapture(gen({ phaseDeg: 62 })).verdict).toBe('healthy');
    expect(analyzeCapture(gen({ phaseDeg: 125 })).verdict).toBe('phase_error');
  });

  it('duty_off is reported beside the verdict for a 30% duty channel', () => {
    const r = analyzeCapture(gen({ a: { dutyPct: 30 } }));
    expect(codes(r)).toContain('duty_off:a');
    expect(Math.abs(r.channels.a.dutyPct - 30)).toBeLessThan(0.7);
  });
});

describe('analyzeCapture: speed across the capture', () => {
  it('follows a motor slowing from 250 Hz to 150 Hz (start/end within 2%) and reports speed_change', () => {
    const r = analyzeCapture(gen({ samples: 40_000, freqHz: 250, endFreqHz: 150 }));
    // Start window = first 20% of the capture: median near 10% in, 250 - 0.1 x 100 = 240 Hz; end near 90%: 160 Hz.
    expect(Math.abs(r.speedTrend!.startHz / 240 - 1)).toBeLessThan(0.02);
    expect(Math.abs(r.speedTrend!.endHz / 160 - 1)).toBeLessThan(0.02);
    expect(r.speedTrend!.changePct).toBeLessThan(-30);
    expect(codes(r)).toContain('speed_change:-');
    expect(r.verdict).toBe('healthy');
    expect(r.channels.a.dropouts).toBe(0);
  });

  it('reports a steady motor as about 0% change', () => {
    const r = analyzeCapture(gen());
    expect(Math.abs(r.speedTrend!.changePct)).toBeLessThan(0.5);
    expect(codes(r)).not.toContain('speed_change:-');
  });
});

describe('analyzeCapture: captures it cannot use', () => {
  it('throws CaptureError (line null) for fewer than two full periods', () => {
    const g = gen({ samples: 700 }); // 7 ms at 200 Hz = 1.4 periods
    expect(() => analyzeCapture(g)).toThrow(CaptureError);
    try {
      analyzeCapture(g);
    } catch (e) {
      expect((e as CaptureError).line).toBeNull();
      expect((e as Error).message).toMatch(/too short: .* fewer than 2 full periods/);
    }
  });

  it('throws for three samples, mismatched arrays and bad options', () => {
    const t = Float64Array.from([0, 1, 2]);
    expect(() => analyzeCapture({ time: t, a: t, b: t })).toThrow(CaptureError);
    expect(() => analyzeCapture({ time: t, a: t, b: Float64Array.from([1]) })).toThrow(RangeError);
    expect(() => analyzeCapture(gen(), { pulsesPerRev: 0 })).toThrow(RangeError);
    expect(() => analyzeCapture(gen(), { supplyV: -5 })).toThrow(RangeError);
  });
});

describe('analyzeCapture: a brief loss of signal', () => {
  it('intermittent: B drops to 0 V for 1 ms in the middle of a 2.5 ms high state (too long for a glitch)', () => {
    const g = gen({ startCycle: 0 });
    // B (90 degrees behind A) is high from 1.25 ms to 3.75 ms of each 5 ms cycle; cycle 20 starts at 100 ms.
    for (let i = Math.round(0.102 * 100_000); i < Math.round(0.103 * 100_000); i++) g.b[i] = 0.2;
    const r = analyzeCapture(g);
    expect(r.verdict).toBe('intermittent');
    expect(r.channels.b.dropouts).toBe(1);
    expect(r.channels.b.glitches).toBe(0);
  });
});
