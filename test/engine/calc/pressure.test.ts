import { describe, expect, it } from 'vitest';
import { absoluteKpaToVacuumInHg, linearSensor, mapAgainstBaroKoeo, vacuumInHgToAbsoluteKpa } from '../../../src/engine/calc';

describe('vacuum and absolute pressure (1 inHg = 3386.389 Pa, NIST SP 811 appendix B)', () => {
  it('turns 20 inHg of vacuum under 101.325 kPa into 33.597 kPa absolute (NIST SP 811 appendix B: 1 inHg = 3386.389 Pa; computed)', () => {
    const r = vacuumInHgToAbsoluteKpa(20, 101.325);
    expect(r.ok && r.value).toBeCloseTo(33.597, 3);
  });

  it('reads one standard atmosphere, 101.325 kPa, as 29.9213 inHg of vacuum from zero absolute (computed)', () => {
    const r = absoluteKpaToVacuumInHg(0, 101.325);
    expect(r.ok && r.value).toBeCloseTo(29.9213, 4);
  });

  it('round-trips 33.597 kPa absolute back to 20 inHg of vacuum', () => {
    const r = absoluteKpaToVacuumInHg(33.59722, 101.325);
    expect(r.ok && r.value).toBeCloseTo(20, 5);
  });

  it.each([
    ['more vacuum than the barometer holds', () => vacuumInHgToAbsoluteKpa(31, 101.325), 'pressure.vacuum_exceeds_baro'],
    ['a barometer of 0 kPa', () => vacuumInHgToAbsoluteKpa(10, 0), 'pressure.baro_not_positive'],
    ['a negative absolute pressure', () => absoluteKpaToVacuumInHg(-1, 101.325), 'pressure.negative_absolute'],
  ])('refuses %s', (_name, run, code) => {
    const r = run();
    expect(!r.ok && r.findings[0]?.code).toBe(code);
  });
});

describe('linear pressure sensor through two calibration points', () => {
  // An invented demo calibration: 0.5 V at 20 kPa, 4.5 V at 105 kPa (the line itself is plain algebra).
  const sensor = linearSensor([
    { volts: 0.5, kpa: 20 },
    { volts: 4.5, kpa: 105 },
  ]);

  it.each([
    [0.5, 20],
    [4.5, 105],
    [2.5, 62.5],
  ])('reads %s V as %s kPa', (volts, kpa) => {
    expect(sensor.ok && sensor.value.kpaAt(volts)).toBeCloseTo(kpa, 9);
  });

  it('gives the voltage at 33.597 kPa and back', () => {
    const v = sensor.ok ? sensor.value.voltsAt(33.597) : Number.NaN;
    expect(v).toBeCloseTo(0.5 + (33.597 - 20) * (4 / 85), 9);
    expect(sensor.ok && sensor.value.kpaAt(v)).toBeCloseTo(33.597, 9);
  });

  it('refuses two points at the same pressure', () => {
    const r = linearSensor([
      { volts: 0.5, kpa: 20 },
      { volts: 4.5, kpa: 20 },
    ]);
    expect(!r.ok && r.findings[0]?.code).toBe('pressure.points_coincide');
  });

  it('names the missing field of a calibration point', () => {
    const r = linearSensor([{ volts: 0.5, kpa: 20 }, { volts: 4.5 } as never]);
    expect(!r.ok && r.findings[0]?.path).toBe('points[1].kpa');
  });
});

describe('MAP against BARO, key on engine off (SAE J1979 PID 0B against PID 33)', () => {
  // Key on, engine off, the manifold is open to the air: both read barometric pressure; agreement within 5 kPa is
  // common practice (no source).
  it.each([
    ['agree at sea level: 101 against 101 kPa', 101, 101, 'agree', 0],
    ['agree within the band: 98 against 101 kPa', 98, 101, 'agree', -3],
    ['a MAP sensor reading high: 112 against 101 kPa', 112, 101, 'map_high', 11],
    ['a MAP sensor reading low at altitude: 70 against 84 kPa', 70, 84, 'map_low', -14],
  ] as const)('%s', (_name, map, baro, verdict, difference) => {
    const r = mapAgainstBaroKoeo(map, baro);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value).toMatchObject({ verdict, differenceKpa: difference });
    if (verdict === 'agree') expect(r.value.finding).toBeUndefined();
    else expect(r.value.finding).toMatchObject({ code: `pressure.map_baro_${verdict}`, path: 'mapKpa' });
  });

  it.each([
    ['a MAP that is not a number', Number.NaN, 101, 'mapKpa'],
    ['a barometric pressure of zero', 101, 0, 'baroKpa'],
  ])('refuses %s with a coded finding at its field', (_name, map, baro, path) => {
    const r = mapAgainstBaroKoeo(map, baro);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.findings[0]!.path).toBe(path);
  });
});
