/**
 * The functions behind the text that the written-out recursions inline (decayFactorSource,
 * cosineAndSineSource, hyperbolicSeriesSource, absorbPivotSource): each helper is written once, as the
 * source text of its statements, and its function is compiled from that same text, so the function the
 * general loops call and the text the generated code inlines cannot drift apart.
 *
 * Where the host forbids run-time compilation (a Content-Security-Policy without 'unsafe-eval'), the
 * written-out recursions do not run either, and `fallback` is used: a plain function with the same meaning
 * (for the exponential and cos/sin, Math's; the results then differ in the last bits, as they do between
 * JavaScript engines).
 *
 * @param parameters the function's parameter names
 * @param body statements ending in `return`, built by the helper's source emitter with literal constants
 * @param bindings values the body refers to by name (tables), passed in as closure variables
 */
export function compileHelper<F extends (...args: never[]) => unknown>(
  parameters: readonly string[],
  body: string,
  bindings: Readonly<Record<string, unknown>>,
  fallback: F,
): F {
  const unpack = Object.keys(bindings).length > 0 ? `const { ${Object.keys(bindings).join(", ")} } = bindings;` : "";
  try {
    const factory = new Function("bindings", `"use strict"; ${unpack} return function (${parameters.join(", ")}) { ${body} };`);
    return factory(bindings) as F;
  } catch {
    return fallback;
  }
}
