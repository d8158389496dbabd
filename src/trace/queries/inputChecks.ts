/** Argument checks shared by the ray queries; each failure is an InputError naming the argument. */
import { InputError } from '../../physics/errors.ts';

/** Checks a flat xyz array and returns its element count. */
export function requireTriples(arr: ArrayLike<number>, place: string): number {
  if (arr.length % 3 !== 0) {
    throw new InputError({ problem: 'length is not a multiple of 3', place, expected: 'x, y, z per element', value: arr.length });
  }
  return arr.length / 3;
}

/** Checks that an optional per-receiver xyz array matches the receiver count. */
export function requireMatchingTriples(arr: ArrayLike<number> | undefined, count: number, place: string): void {
  if (arr !== undefined && arr.length !== count * 3) {
    throw new InputError({ problem: 'length does not match the receiver count', place, expected: `${count * 3} numbers (xyz per receiver)`, value: arr.length });
  }
}

/** Checks a receiver range [start, end) against the count. */
export function requireRange(start: number, end: number, count: number, place: string): void {
  if (!Number.isInteger(start) || !Number.isInteger(end) || start < 0 || end > count || start > end) {
    throw new InputError({ problem: 'bad receiver range', place, expected: `integers with 0 <= start <= end <= ${count}`, value: [start, end] });
  }
}

/** Checks a sample count that must be a positive perfect square (a side × side jittered grid); returns the side. */
export function requireSquareCount(n: number, place: string): number {
  const side = Math.round(Math.sqrt(n));
  if (!Number.isInteger(n) || n < 1 || side * side !== n) {
    throw new InputError({ problem: 'not a positive perfect square', place, expected: 'a sample count like 1, 4, 9, 16, 64, 256, 1024 (a jittered side × side grid)', value: n });
  }
  return side;
}

/** Checks a non-negative finite number. */
export function requireNonNegative(v: number, place: string, unit: string): void {
  if (!Number.isFinite(v) || v < 0) {
    throw new InputError({ problem: 'not a non-negative finite number', place, expected: `a number >= 0 ${unit}`, value: v });
  }
}
