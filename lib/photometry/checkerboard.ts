import { michelson } from './contrast';

export interface CheckerboardContrast {
  /** Parity of the white cells: 0 when the top-left cell (row + column even) is white. */
  whiteParity: 0 | 1;
  white: number;
  black: number;
  ansiContrast: number;
  michelson: number;
  /** Smallest white cell over largest black cell; below 1 the board was not read cleanly. */
  separation: number;
}

/**
 * Checkerboard contrast from 16 cell means (row-major 4 × 4). The brighter parity group is white,
 * since which corner is white varies between pattern generators.
 */
export function checkerboardContrast(cells: ArrayLike<number>): CheckerboardContrast {
  if (cells.length !== 16) throw new RangeError(`checkerboard needs 16 cell means, got ${cells.length}`);
  const groups: [number[], number[]] = [[], []];
  for (let i = 0; i < 16; i++) {
    const v = cells[i] as number;
    if (!Number.isFinite(v)) throw new RangeError(`cell ${i} is not finite`);
    const parity = ((i % 4) + Math.floor(i / 4)) % 2;
    groups[parity as 0 | 1].push(v);
  }
  const mean = (xs: number[]): number => xs.reduce((a, b) => a + b, 0) / xs.length;
  const m0 = mean(groups[0]);
  const m1 = mean(groups[1]);
  const whiteParity: 0 | 1 = m0 >= m1 ? 0 : 1;
  const whites = groups[whiteParity];
  const blacks = groups[whiteParity === 0 ? 1 : 0];
  const white = mean(whites);
  const black = mean(blacks);
  // ANSI/NAPM IT7.228-1997, ANSI/InfoComm 3M-2011: CR = mean of 8 whites / mean of 8 blacks
  const ansiContrast = black === 0 ? Infinity : white / black;
  const maxBlack = Math.max(...blacks);
  return {
    whiteParity,
    white,
    black,
    ansiContrast,
    michelson: michelson(white, black),
    separation: maxBlack === 0 ? Infinity : Math.min(...whites) / maxBlack,
  };
}
