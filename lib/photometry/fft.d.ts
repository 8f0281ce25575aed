// fft.js ships loose `any` declarations; this narrows the calls the engine makes.
declare module 'fft.js' {
  export default class FFT {
    constructor(size: number);
    readonly size: number;
    createComplexArray(): number[];
    transform(out: ArrayLike<number> & { length: number }, data: ArrayLike<number>): void;
    inverseTransform(out: ArrayLike<number> & { length: number }, data: ArrayLike<number>): void;
    realTransform(out: ArrayLike<number> & { length: number }, data: ArrayLike<number>): void;
    completeSpectrum(spectrum: ArrayLike<number>): void;
  }
}
