import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { computeMcf, type McfPoint, type McfUnit } from './mcf';

// REFERENCES.md §1A: five-system example from the documentation of the Python package `reliability` (a);
// recomputed values and the robust/naive variances with R survival (b).
const FIVE_SYSTEMS: McfUnit[] = [
  { id: 'S1', endAgeDays: 17, eventAgesDays: [5, 10, 15] },
  { id: 'S2', endAgeDays: 19, eventAgesDays: [6, 13, 17] },
  { id: 'S3', endAgeDays: 26, eventAgesDays: [12, 20, 25] },
  { id: 'S4', endAgeDays: 24, eventAgesDays: [13, 15] },
  { id: 'S5', endAgeDays: 28, eventAgesDays: [16, 22, 25] },
];

// REFERENCES.md §1B: Nelson (1995) valve-seat data, 41 engines (engine, end age, replacement ages) from
// references/valve_seats_nelson1995.csv (a: R package reda data, ref. Nelson 1995).
const VALVE_SEATS: Array<[number, number, number[]]> = [
  [251, 761, []], [252, 759, []], [327, 667, [98]], [328, 667, [326, 653, 653]], [329, 665, []],
  [330, 667, [84]], [331, 663, [87]], [389, 653, [646]], [390, 653, [92]], [391, 651, []],
  [392, 650, [258, 328, 377, 621]], [393, 648, [61, 539]], [394, 644, [254, 276, 298, 640]], [395, 642, [76, 538]],
  [396, 641, [635]], [397, 649, [349, 404, 561]], [398, 631, []], [399, 596, []], [400, 614, [120, 479]],
  [401, 582, [323, 449]], [402, 589, [139, 139]], [403, 593, []], [404, 589, [573]], [405, 606, [165, 408, 604]],
  [406, 594, [249]], [407, 613, [344, 497]], [408, 595, [265, 586]], [409, 389, [166, 206, 348]], [410, 601, []],
  [411, 601, [410, 581]], [412, 611, []], [413, 608, []], [414, 587, []], [415, 603, [367]], [416, 585, [202, 563, 570]],
  [417, 587, []], [418, 578, []], [419, 578, []], [420, 586, []], [421, 585, []], [422, 582, []],
];
const valveUnits = (): McfUnit[] => VALVE_SEATS.map(([id, end, ev]) => ({ id, endAgeDays: end, eventAgesDays: ev }));

// REFERENCES.md §1B, references/valve_seats_mcf_computed.csv (b: R 4.2.2 + survival 3.5-3):
// [age, n, d, MCF, robust variance, naive Poisson variance] at every distinct event age.
const VALVE_TABLE: Array<[number, number, number, number, number, number]> = [
  [61, 41, 1, 0.024390243902439, 0.000580374631824843, 0.000594883997620464],
  [76, 41, 1, 0.0487804878048781, 0.00113173053205844, 0.00118976799524093],
  [84, 41, 1, 0.0731707317073171, 0.0016540677007008, 0.00178465199286139],
  [87, 41, 1, 0.0975609756097561, 0.00214738613775192, 0.00237953599048186],
  [92, 41, 1, 0.121951219512195, 0.00261168584321179, 0.00297441998810232],
  [98, 41, 1, 0.146341463414634, 0.00304696681708042, 0.00356930398572278],
  [120, 41, 1, 0.170731707317073, 0.00345322905935782, 0.00416418798334325],
  [139, 41, 2, 0.219512195121951, 0.0053684653443798, 0.00535395597858418],
  [165, 41, 1, 0.24390243902439, 0.00568767139188346, 0.00594883997620464],
  [166, 41, 1, 0.268292682926829, 0.00597785870779588, 0.0065437239738251],
  [202, 41, 1, 0.292682926829268, 0.00623902729211706, 0.00713860797144557],
  [206, 41, 1, 0.317073170731707, 0.00766094514008793, 0.00773349196906603],
  [249, 41, 1, 0.341463414634146, 0.00786407626122662, 0.0083283759666865],
  [254, 41, 1, 0.365853658536585, 0.00803818865077407, 0.00892325996430696],
  [258, 41, 1, 0.390243902439024, 0.00818328230873028, 0.00951814396192742],
  [265, 41, 1, 0.414634146341463, 0.00829935723509525, 0.0101130279595479],
  [276, 41, 1, 0.439024390243902, 0.00957618142510991, 0.0107079119571684],
  [298, 41, 1, 0.463414634146341, 0.0120137548787742, 0.0113027959547888],
  [323, 41, 1, 0.48780487804878, 0.0120427736103655, 0.0118976799524093],
  [326, 41, 1, 0.51219512195122, 0.0120427736103655, 0.0124925639500297],
  [328, 41, 1, 0.536585365853659, 0.0132035228740152, 0.0130874479476502],
  [344, 41, 1, 0.560975609756098, 0.0131454854108327, 0.0136823319452707],
  [348, 41, 1, 0.585365853658537, 0.0154379652065408, 0.0142772159428911],
  [349, 41, 1, 0.609756097560976, 0.0153218902801759, 0.0148720999405116],
  [367, 41, 1, 0.634146341463415, 0.0151767966222196, 0.0154669839381321],
  [377, 41, 1, 0.658536585365854, 0.017382220223154, 0.0160618679357525],
  [404, 40, 1, 0.683536585365854, 0.0184794001012028, 0.0166868679357525],
  [408, 40, 1, 0.708536585365854, 0.0195453299792516, 0.0173118679357525],
  [410, 40, 1, 0.733536585365854, 0.0193604976621784, 0.0179368679357525],
  [449, 40, 1, 0.758536585365854, 0.0203639275402272, 0.0185618679357525],
  [479, 40, 1, 0.783536585365854, 0.021336107418276, 0.0191868679357525],
  [497, 40, 1, 0.808536585365854, 0.0222770372963248, 0.0198118679357525],
  [538, 40, 1, 0.833536585365854, 0.0231867171743736, 0.0204368679357525],
  [539, 40, 1, 0.858536585365854, 0.0240651470524223, 0.0210618679357525],
  [561, 40, 1, 0.883536585365854, 0.0261623269304711, 0.0216868679357525],
  [563, 40, 1, 0.908536585365854, 0.0269782568085199, 0.0223118679357525],
  [570, 40, 1, 0.933536585365854, 0.0290129366865687, 0.0229368679357525],
  [573, 40, 1, 0.958536585365854, 0.0285468543694955, 0.0235618679357525],
  [581, 38, 1, 0.984852374839538, 0.0293106718924936, 0.0242543887113758],
  [586, 34, 1, 1.01426413954542, 0.0302218505343667, 0.02511944061449],
  [604, 22, 1, 1.05971868499997, 0.0342475693227341, 0.0271855563169693],
  [621, 17, 1, 1.11854221441173, 0.0430574465523837, 0.0306457639294261],
  [635, 16, 1, 1.18104221441173, 0.042811064177025, 0.0345520139294261],
  [640, 16, 1, 1.24354221441173, 0.051222742015081, 0.0384582639294261],
  [646, 13, 1, 1.32046529133481, 0.0522146058387769, 0.0443754236927397],
  [653, 9, 2, 1.54268751355703, 0.0971295089289284, 0.069066781717431],
];

/** The MCF step function at an age: the last point at or before it. */
function at(points: McfPoint[], ageDays: number): McfPoint {
  let found: McfPoint | undefined;
  for (const p of points) if (p.ageDays <= ageDays) found = p;
  if (!found) throw new Error(`no point at or before ${ageDays}`);
  return found;
}

describe('computeMcf — five-system example (REFERENCES §1A)', () => {
  const points = computeMcf({ units: FIVE_SYSTEMS });

  it('MCF at 5, 10, 13, 17, 20, 22, 25 = 0.2, 0.6, 1.2, 2.0, 2.3333, 2.6667, 3.6667 (published (a), recomputed (b))', () => {
    const expected: Array<[number, number]> = [[5, 0.2], [10, 0.6], [13, 1.2], [17, 2.0], [20, 2.333333333], [22, 2.666666667], [25, 3.666666667]];
    for (const [age, mcf] of expected) expect(at(points, age).mcf).toBeCloseTo(mcf, 8);
  });

  it('robust (Lawless–Nadeau) variance at 5/10/13/17/20/25 = 0.032, 0.128, 0.112, 0.16, 0.1896296, 0.1451852 ((b), survfit robust=TRUE)', () => {
    const expected: Array<[number, number]> = [[5, 0.032], [10, 0.128], [13, 0.112], [17, 0.16], [20, 0.1896296], [25, 0.1451852]];
    for (const [age, variance] of expected) expect(at(points, age).variance).toBeCloseTo(variance, 6);
  });

  it('naive Poisson variance at 5/10/13/17/20/25 = 0.04, 0.12, 0.24, 0.40, 0.511111, 1.122222 ((b))', () => {
    const expected: Array<[number, number]> = [[5, 0.04], [10, 0.12], [13, 0.24], [17, 0.4], [20, 0.511111], [25, 1.122222]];
    for (const [age, variance] of expected) expect(at(points, age).varianceNaive).toBeCloseTo(variance, 6);
  });

  it('tie rule: S2 ends at 19 after its event at 17, S1 ends at 17 and is still at risk at 17', () => {
    expect(at(points, 17).atRisk).toBe(5);
    expect(at(points, 20).atRisk).toBe(3);
    expect(at(points, 25)).toMatchObject({ atRisk: 2, events: 2 });
  });

  it('distinct ages only: tied ages 13 and 25 give one point each', () => {
    expect(points.map((p) => p.ageDays)).toEqual([5, 6, 10, 12, 13, 15, 16, 17, 20, 22, 25]);
    expect(at(points, 13).events).toBe(2);
  });
});

describe('computeMcf — valve seats (REFERENCES §1B, Nelson 1995 data; values (b) R survival)', () => {
  const points = computeMcf({ units: valveUnits() });

  it('matches the full R table: age, n, d, MCF and robust variance at every event age', () => {
    expect(points).toHaveLength(VALVE_TABLE.length);
    VALVE_TABLE.forEach(([age, n, d, mcf, varRobust, varNaive], i) => {
      const p = points[i] as McfPoint;
      expect(p.ageDays).toBe(age);
      expect(p.atRisk).toBe(n);
      expect(p.events).toBe(d);
      expect(Math.abs(p.mcf - mcf)).toBeLessThan(1e-10);
      expect(Math.abs(p.variance - varRobust)).toBeLessThan(1e-10);
      expect(Math.abs(p.varianceNaive - varNaive)).toBeLessThan(1e-10);
    });
  });

  it('MCF and robust se at 100…≥653 days (REFERENCES §1B table, (b))', () => {
    const table: Array<[number, number, number]> = [
      [100, 0.1463414634, 0.05519933711], [200, 0.2682926829, 0.0773166134], [300, 0.4634146341, 0.10960727567],
      [400, 0.6585365854, 0.13184164829], [500, 0.8085365854, 0.14925494061], [600, 1.0142641395, 0.17384432845],
      [650, 1.3204652913, 0.22850515495], [761, 1.5426875136, 0.31165607475],
    ];
    for (const [age, mcf, se] of table) {
      expect(at(points, age).mcf).toBeCloseTo(mcf, 9);
      expect(Math.sqrt(at(points, age).variance)).toBeCloseTo(se, 9);
    }
  });

  it('95% log-normal limits at 500 d [0.563078, 1.160995] and 600 d [0.724862, 1.419210] (REFERENCES §1B, (b))', () => {
    expect(at(points, 500).lower).toBeCloseTo(0.563078, 6);
    expect(at(points, 500).upper).toBeCloseTo(1.160995, 6);
    expect(at(points, 600).lower).toBeCloseTo(0.724862, 6);
    expect(at(points, 600).upper).toBeCloseTo(1.41921, 6);
  });

  it('tied events inside one unit (engine 402 at 139, 328 at 653) count twice (REFERENCES §1B survfit gotcha: MCF(200) = 0.2683, not 0.2439)', () => {
    expect(at(points, 200).mcf).toBeCloseTo(0.2682926829, 9);
  });

  it('robust se is smaller than naive early and larger late (REFERENCES §1B, (b))', () => {
    expect(at(points, 100).variance).toBeLessThan(at(points, 100).varianceNaive);
    expect(at(points, 700).variance).toBeGreaterThan(at(points, 700).varianceNaive);
  });
});

describe('computeMcf — edge cases', () => {
  it('no units or no events: no points', () => {
    expect(computeMcf({ units: [] })).toEqual([]);
    expect(computeMcf({ units: [{ id: 1, endAgeDays: 10, eventAgesDays: [] }] })).toEqual([]);
  });

  it('a single unit: MCF counts its events, variance 0, limits collapse', () => {
    const points = computeMcf({ units: [{ id: 1, endAgeDays: 10, eventAgesDays: [3, 3, 7] }] });
    expect(points.map((p) => [p.ageDays, p.mcf, p.atRisk])).toEqual([[3, 2, 1], [7, 3, 1]]);
    for (const p of points) {
      expect(p.variance).toBeCloseTo(0, 12);
      expect(p.lower).toBeCloseTo(p.mcf, 9);
    }
  });

  it('ignores events after the end age or before age 0, and units with a negative end age', () => {
    const points = computeMcf({
      units: [
        { id: 1, endAgeDays: 10, eventAgesDays: [-1, 4, 11] },
        { id: 2, endAgeDays: -5, eventAgesDays: [1] },
        { id: 3, endAgeDays: 20, eventAgesDays: [] },
      ],
    });
    expect(points).toHaveLength(1);
    expect(points[0]).toMatchObject({ ageDays: 4, mcf: 0.5, atRisk: 2 });
  });

  it('90% limits are narrower than 95%', () => {
    const p95 = at(computeMcf({ units: FIVE_SYSTEMS }), 20);
    const p90 = at(computeMcf({ units: FIVE_SYSTEMS }, { confidence: 0.9 }), 20);
    expect(p90.upper - p90.lower).toBeLessThan(p95.upper - p95.lower);
    // REFERENCES §1A uses log-normal limits M·exp(±z·se/M); with z = qnorm(0.95) and the robust se here:
    expect(p90.upper).toBeCloseTo(p90.mcf * Math.exp((1.6448536269514722 * Math.sqrt(p90.variance)) / p90.mcf), 10);
  });
});

describe('computeMcf — robust variance against the defining double sum', () => {
  /** Var(t) = Σ_i [Σ_{t_k ≤ t} δ_i(t_k)(d_i(t_k) − d(t_k)/n(t_k))/n(t_k)]², written out directly (O(units × ages)). */
  function bruteForce(units: McfUnit[]): Array<[number, number, number]> {
    const ages = [...new Set(units.flatMap((u) => u.eventAgesDays.filter((a) => a >= 0 && a <= u.endAgeDays)))].sort((a, b) => a - b);
    const inner = new Array<number>(units.length).fill(0);
    let mcf = 0;
    return ages.map((t) => {
      const atRisk = units.map((u) => u.endAgeDays >= t);
      const n = atRisk.filter(Boolean).length;
      const di = units.map((u) => u.eventAgesDays.filter((a) => a === t && a <= u.endAgeDays).length);
      const d = di.reduce((s, x) => s + x, 0);
      units.forEach((_, i) => {
        if (atRisk[i]) inner[i] = (inner[i] as number) + ((di[i] as number) - d / n) / n;
      });
      mcf += d / n;
      return [t, mcf, inner.reduce((s, x) => s + x * x, 0)];
    });
  }

  it('agrees on random fleets with ties (fast-check)', () => {
    const unit = fc.record({
      endAgeDays: fc.integer({ min: 0, max: 40 }),
      eventAgesDays: fc.array(fc.integer({ min: 0, max: 45 }), { maxLength: 6 }),
    });
    fc.assert(
      fc.property(fc.array(unit, { minLength: 1, maxLength: 12 }), (raw) => {
        const units = raw.map((u, i) => ({ id: i, ...u }));
        const expected = bruteForce(units);
        const points = computeMcf({ units });
        expect(points).toHaveLength(expected.length);
        points.forEach((p, k) => {
          const [t, mcf, variance] = expected[k] as [number, number, number];
          expect(p.ageDays).toBe(t);
          expect(p.mcf).toBeCloseTo(mcf, 10);
          expect(p.variance).toBeCloseTo(variance, 10);
        });
      }),
      { numRuns: 300 },
    );
  });
});
