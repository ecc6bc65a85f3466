// The part of jstat (a general-purpose statistics library) the tests use as an outside reference.
declare module 'jstat' {
  interface Normal {
    cdf(x: number, mean: number, sd: number): number;
    inv(p: number, mean: number, sd: number): number;
  }
  const jstat: { normal: Normal };
  export default jstat;
}
