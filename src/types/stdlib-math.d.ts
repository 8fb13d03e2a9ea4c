// The @stdlib/math leaf modules are CommonJS folders; Node's ES-module loader needs their explicit file path
// (".../lib/index.js"), which carries no type declaration. Each used here is a scalar function of a number.
declare module "@stdlib/math/base/special/*/lib/index.js" {
  const specialFunction: (x: number) => number;
  export default specialFunction;
}
