import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { decodeScaleOffset, encodeScaleOffset } from '../../pipeline/read/cf-scale.ts';
import { decodeMask, encodeMask, maskSpecOf } from '../../pipeline/read/cf-mask.ts';
import { decodeTimes, encodeTimes, isoSeconds, parseTimeUnits } from '../../pipeline/read/cf-time.ts';
import { decodeRun, makeDecodePlan } from '../../pipeline/read/decode.ts';
import { expectCatalogued } from './helpers.ts';

const H = 3_600_000;

describe('CF packing coder (CF conventions §8.1: unpacked = packed * scale_factor + add_offset)', () => {
  it('decode(encode(x)) is within half a packing step of x for int16 packing (property, fast-check)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-6, max: 10, noNaN: true }),
        fc.double({ min: -1e4, max: 1e4, noNaN: true }),
        fc.array(fc.integer({ min: -32000, max: 32000 }), { minLength: 1, maxLength: 50 }),
        (scale, offset, steps) => {
          const so = { scale, offset };
          const x = steps.map((k) => offset + k * scale + scale * 0.3);
          const back = decodeScaleOffset(encodeScaleOffset(x, so, 'short'), so);
          return x.every((v, i) => Math.abs(back[i] - v) <= scale / 2 + 1e-9 * Math.abs(v));
        },
      ),
    );
  });

  it('encode(decode(p)) is the identity on packed integers (property, fast-check)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-4, max: 10, noNaN: true }),
        fc.double({ min: -300, max: 300, noNaN: true }),
        fc.array(fc.integer({ min: -32767, max: 32767 })),
        (scale, offset, p) => {
          const so = { scale, offset };
          const again = encodeScaleOffset(decodeScaleOffset(p, so), so, 'short');
          return p.every((v, i) => again[i] === v);
        },
      ),
    );
  });
});

describe('CF missing-data coder (CF conventions §2.5.1)', () => {
  it('decodeMask(encodeMask(x)) keeps every value and every NaN (property, fast-check)', () => {
    const spec = { fill: [-32767], validMin: -Infinity, validMax: Infinity };
    fc.assert(
      fc.property(fc.array(fc.oneof(fc.integer({ min: -32766, max: 32767 }), fc.constant(NaN))), (x) => {
        const back = decodeMask(encodeMask(x, spec), spec);
        return x.every((v, i) => (Number.isNaN(v) ? Number.isNaN(back[i]) : back[i] === v));
      }),
    );
  });

  it('_FillValue, missing_value, NaN already in the data and valid_range all count as missing', () => {
    const v = {
      type: 'short' as const,
      attrs: { _FillValue: -999, missing_value: -998, valid_range: [-500, 500] },
      attrTypes: { _FillValue: 'short' as const, missing_value: 'short' as const, valid_range: 'short' as const },
    };
    const m = maskSpecOf(v, { scale: 1, offset: 0 });
    const out = decodeMask([-999, -998, 0, 501, -501, 500, NaN], m);
    expect(Array.from(out).map((x) => (Number.isNaN(x) ? 'm' : x))).toEqual(['m', 'm', 0, 'm', 'm', 500, 'm']);
  });

  it('a valid_range typed like the unpacked data is turned into packed units (CF §8.1)', () => {
    const v = {
      type: 'short' as const,
      attrs: { scale_factor: 0.01, add_offset: 0, valid_min: -3.0 },
      attrTypes: { scale_factor: 'float' as const, add_offset: 'float' as const, valid_min: 'float' as const },
    };
    const m = maskSpecOf(v, { scale: 0.01, offset: 0 });
    expect(m.validMin).toBeCloseTo(-300, 9);
  });

  it('without _FillValue the netCDF default fill of the type is used (netCDF-C netcdf.h NC_FILL_SHORT = -32767)', () => {
    expect(maskSpecOf({ type: 'short', attrs: {}, attrTypes: {} }, { scale: 1, offset: 0 }).fill).toEqual([-32767]);
  });

  it('the fused decoder equals mask then unpack then unit conversion, and counts the missing values', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: -32767, max: 32767 }), { minLength: 1 }), fc.double({ min: 1e-4, max: 1, noNaN: true }), (raw, scale) => {
        const spec = { fill: [-32767], validMin: -Infinity, validMax: Infinity };
        const so = { scale, offset: 280 };
        const p = makeDecodePlan(spec, so, { k: 1, c: -273.15 });
        const out = new Float32Array(raw.length);
        const missing = decodeRun(Int16Array.from(raw), 0, raw.length, out, 0, p);
        const ref = decodeScaleOffset(decodeMask(raw, spec), so);
        return (
          missing === raw.filter((x) => x === -32767).length &&
          raw.every((_, i) => (Number.isNaN(ref[i]) ? Number.isNaN(out[i]) : Math.abs(out[i] - Math.fround(ref[i] - 273.15)) < 1e-3))
        );
      }),
    );
  });
});

describe('CF time coder (CF conventions §4.4)', () => {
  it('decode(encode(t)) returns t for whole seconds in hours/seconds/days/minutes codings (property, fast-check)', () => {
    const codings = ['hours since 1900-01-01 00:00:00.0', 'seconds since 1970-01-01', 'days since 1950-01-01', 'minutes since 2000-01-01T00:00:00Z'].map((u) =>
      parseTimeUnits(u, 'proleptic_gregorian'),
    );
    fc.assert(
      fc.property(fc.integer({ min: -2_000_000_000, max: 4_000_000_000 }), fc.integer({ min: 0, max: 3 }), (sec, ci) => {
        const ms = sec * 1000;
        return decodeTimes(encodeTimes([ms], codings[ci]), codings[ci])[0] === ms;
      }),
    );
  });

  it('the legacy ERA5 units "hours since 1900-01-01 00:00:00.0" put hour 1051896 at 2020-01-01T00:00Z (hour count: 120 years × 365.25 − 1 day, by hand)', () => {
    // 1900-01-01 to 2020-01-01: 120 years, 29 leap days (1904…2016; 1900 is not a leap year) → 43829 days.
    const c = parseTimeUnits('hours since 1900-01-01 00:00:00.0', 'gregorian');
    expect(isoSeconds(decodeTimes([43829 * 24], c)[0])).toBe('2020-01-01T00:00:00Z');
  });

  it('reads a "+0:00" suffix (flxf06.gdas.1979.grb2.nc, r-cran-ncdfgeom), a T separator, Z, fractional seconds and offsets', () => {
    expect(parseTimeUnits('hours since 1979-01-01 00:00:00.0 +0:00').referenceMs).toBe(Date.UTC(1979, 0, 1));
    expect(parseTimeUnits('seconds since 1970-01-01T00:00:00Z').referenceMs).toBe(0);
    expect(parseTimeUnits('seconds since 1970-01-01 00:00:01.5').referenceMs).toBe(1500);
    expect(parseTimeUnits('hours since 2000-01-01 06:00:00 +06:00').referenceMs).toBe(Date.UTC(2000, 0, 1));
    expect(parseTimeUnits('DAYS since 1950-1-1').unitMs).toBe(24 * H);
    expect(parseTimeUnits('hour since 1990-01-01').unitMs).toBe(H);
  });

  it('standard and gregorian are read as proleptic Gregorian from 1582-10-15 on; earlier reference dates are a NetcdfCalendarUnsupported error', async () => {
    expect(parseTimeUnits('days since 1582-10-15', 'standard').referenceMs).toBe(Date.UTC(1582, 9, 15));
    await expectCatalogued(() => parseTimeUnits('hour since 0000-01-01 00:00:00'), 'NetcdfCalendarUnsupported', /before 1582-10-15/);
    expect(parseTimeUnits('hours since 0001-01-01', 'proleptic_gregorian').referenceMs).toBe(new Date('0001-01-01T00:00:00Z').getTime());
  });

  it('model calendars (noleap, 360_day, julian, ...) are a NetcdfCalendarUnsupported error naming the calendar', async () => {
    for (const cal of ['noleap', '365_day', '360_day', 'julian', 'all_leap', 'none', 'martian']) {
      await expectCatalogued(() => parseTimeUnits('days since 2000-01-01', cal), 'NetcdfCalendarUnsupported', new RegExp(cal));
    }
  });

  it('months, years, nonsense units and impossible dates are NetcdfTimeUnits errors', async () => {
    await expectCatalogued(() => parseTimeUnits('months since 2000-01-01'), 'NetcdfTimeUnits', /no fixed length/);
    await expectCatalogued(() => parseTimeUnits('Month'), 'NetcdfTimeUnits');
    await expectCatalogued(() => parseTimeUnits('fortnights since 2000-01-01'), 'NetcdfTimeUnits');
    await expectCatalogued(() => parseTimeUnits('days since 2001-02-29'), 'NetcdfTimeUnits', /not a valid date/);
  });
});
