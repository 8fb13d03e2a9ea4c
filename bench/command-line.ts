/** The number after `--name` on the benchmark's command line, or `fallback` when the option is absent. */
export function numberArgument(name: string, fallback: number): number {
  const index = process.argv.indexOf(`--${name}`);
  return index >= 0 ? Number(process.argv[index + 1]) : fallback;
}
