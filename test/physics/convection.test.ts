import { describe, expect, it } from 'vitest';
import {
  convectionCoeffIso6946Wm2K,
  convectionCoeffMcAdams1954Wm2K,
  exteriorConvectionCoeffWm2K,
} from '../../src/physics/convection.ts';
import { InputError } from '../../src/physics/errors.ts';

describe('exterior convection coefficients', () => {
  it('McAdams 1954 (after Jürges 1924) linear range', () => {
    // source: REFERENCE-VALUES §8 [derived from the from-memory coefficients 5.7 + 3.8 v]: 9.5 at 1, 17.1 at 3 m/s; tol 1e-9
    expect(convectionCoeffMcAdams1954Wm2K(0)).toBeCloseTo(5.7, 9);
    expect(convectionCoeffMcAdams1954Wm2K(1)).toBeCloseTo(9.5, 9);
    expect(convectionCoeffMcAdams1954Wm2K(3)).toBeCloseTo(17.1, 9);
  });

  it('McAdams high-wind branch joins the linear branch', () => {
    // from memory: McAdams 7.2 v^0.78 above 4.88 m/s; the two branches meet within 3 % at the switch
    const below = convectionCoeffMcAdams1954Wm2K(4.8799);
    const above = convectionCoeffMcAdams1954Wm2K(4.88);
    expect(Math.abs(above - below) / below).toBeLessThan(0.03);
    expect(convectionCoeffMcAdams1954Wm2K(10)).toBeGreaterThan(above);
  });

  it('ISO 6946 h_ce = 4 + 4 v', () => {
    // source: ISO 6946:2017 Annex C via REFERENCE-VALUES §8 (from memory): 4 + 4·v; tol 1e-9
    expect(convectionCoeffIso6946Wm2K(0)).toBeCloseTo(4, 9);
    expect(convectionCoeffIso6946Wm2K(4)).toBeCloseTo(20, 9);
    // source: REFERENCE-VALUES §8 [derived]: v = 4, ε 0.9, 0 °C → R_se = 1/(20 + 4.16) = 0.0414; tol 5e-4
    const hr = 0.9 * 4 * 5.670374419e-8 * 273.15 ** 3;
    expect(1 / (convectionCoeffIso6946Wm2K(4) + hr)).toBeCloseTo(0.0414, 3);
  });

  it('dispatcher selects by name and rejects bad input', () => {
    // common practice: dispatcher equals the named function; tol exact
    expect(exteriorConvectionCoeffWm2K('iso6946', 1)).toBe(convectionCoeffIso6946Wm2K(1));
    expect(exteriorConvectionCoeffWm2K('mcadams1954', 2)).toBe(convectionCoeffMcAdams1954Wm2K(2));
    expect(() => exteriorConvectionCoeffWm2K('nope' as 'iso6946', 1)).toThrow(InputError);
    expect(() => convectionCoeffIso6946Wm2K(-1)).toThrow(/windLocalMs/);
  });
});
