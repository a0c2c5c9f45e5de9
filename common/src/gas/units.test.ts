import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import convert from 'convert-units';
import { InvalidInputError } from '../api/errors';
import {
  absoluteToGaugeBar,
  barToPsi,
  celsiusToFahrenheit,
  celsiusToKelvin,
  convertPressure,
  convertTemperature,
  convertVolume,
  cubicFeetToLitres,
  fahrenheitToCelsius,
  gaugeToAbsoluteBar,
  kelvinToCelsius,
  psiToBar,
  type PressureUnit,
} from './units';

describe('units', () => {
  it('uses the exact definitions of psi and cubic foot', () => {
    // NIST SP 811: 1 psi = 6.894 757 293 168 kPa; 1 ft³ = 0.028 316 846 592 m³ (exact)
    expect(psiToBar(1)).toBeCloseTo(0.06894757293168, 13);
    expect(cubicFeetToLitres(1)).toBeCloseTo(28.316846592, 9);
    // 14.696 psia = 1.01325 bar (standard atmosphere, 101.325 kPa)
    expect(psiToBar(14.6959488)).toBeCloseTo(1.01325, 6);
    // 2000 psi is the classic 137 bar fill (Taylor & Francis "Medical gases" chapter; anaesthesia revision notes)
    expect(psiToBar(2000)).toBeCloseTo(137.9, 1);
  });

  it('agrees with convert-units within its rounding (≈5e-7)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.001, max: 1e4, noNaN: true }), (x) => {
        expect(Math.abs(psiToBar(x) / convert(x).from('psi').to('bar') - 1)).toBeLessThan(1e-6);
        expect(Math.abs(convertVolume(x, 'ft3', 'L') / convert(x).from('ft3').to('l') - 1)).toBeLessThan(1e-6);
        expect(Math.abs(convertVolume(x, 'm3', 'L') / convert(x).from('m3').to('l') - 1)).toBeLessThan(1e-12);
        expect(convertTemperature(x, 'F', 'C')).toBeCloseTo(convert(x).from('F').to('C'), 9);
      }),
      { numRuns: 200, seed: 5 },
    );
  });

  it('converts gauge and absolute only with the atmospheric pressure', () => {
    expect(gaugeToAbsoluteBar(200, 1.01325)).toBeCloseTo(201.01325, 10);
    expect(absoluteToGaugeBar(201.01325)).toBeCloseTo(200, 10);
    expect(gaugeToAbsoluteBar(200, 0.9)).toBeCloseTo(200.9, 10);
    // 2000 psig at sea level is 2014.7 psia (common practice)
    expect(convertPressure(2000, 'psi_g', 'psi_a', 1.01325)).toBeCloseTo(2014.696, 2);
    expect(convertPressure(2, 'MPa_a', 'kPa_a')).toBeCloseTo(2000, 9);
    expect(() => convertPressure(10, 'bar_g', 'bar_a')).toThrow(InvalidInputError);
    expect(() => gaugeToAbsoluteBar(10, 0)).toThrow(InvalidInputError);
    fc.assert(
      fc.property(
        fc.double({ min: -1, max: 400, noNaN: true }),
        fc.constantFrom<PressureUnit>('bar_g', 'bar_a', 'psi_g', 'psi_a', 'kPa_g', 'kPa_a', 'MPa_g', 'MPa_a'),
        fc.constantFrom<PressureUnit>('bar_g', 'bar_a', 'psi_g', 'psi_a', 'kPa_g', 'kPa_a', 'MPa_g', 'MPa_a'),
        fc.double({ min: 0.6, max: 1.1, noNaN: true }),
        (bar, a, b, atm) => {
          const there = convertPressure(bar, 'bar_a', a, atm);
          const back = convertPressure(convertPressure(there, a, b, atm), b, 'bar_a', atm);
          expect(back).toBeCloseTo(bar, 8);
        },
      ),
      { numRuns: 200, seed: 9 },
    );
  });

  it('converts temperatures and rejects values below absolute zero or NaN', () => {
    // 70 °F = 21.111 °C, the US reference temperature (definition)
    expect(fahrenheitToCelsius(70)).toBeCloseTo(21.1111, 4);
    expect(celsiusToFahrenheit(15)).toBeCloseTo(59, 10);
    expect(celsiusToKelvin(15)).toBeCloseTo(288.15, 10);
    expect(kelvinToCelsius(273.15)).toBeCloseTo(0, 10);
    expect(() => celsiusToKelvin(-300)).toThrow(InvalidInputError);
    expect(() => barToPsi(Number.NaN)).toThrow(InvalidInputError);
    expect(() => convertVolume(1, 'gal' as 'L', 'L')).toThrow(InvalidInputError);
  });
});
