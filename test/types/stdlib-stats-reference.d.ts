// The @stdlib/stats strided modules the tests use as references are CommonJS folders; Node's ES-module
// loader needs their explicit file path (".../lib/index.js"), which carries no type declaration.
declare module "@stdlib/stats/strided/mediansorted/lib/index.js" {
  /** The median of `n` sorted values of `x`, read with stride `strideX`. */
  const mediansorted: (n: number, x: ArrayLike<number>, strideX: number) => number;
  export default mediansorted;
}
