// The @stdlib/stats leaf modules are CommonJS folders; Node's ES-module loader needs their explicit file path
// (".../lib/index.js"), which carries no type declaration. Each is a scalar function of numbers.
declare module "@stdlib/stats/base/dists/*/lib/index.js" {
  const distributionFunction: (...args: number[]) => number;
  export default distributionFunction;
}
