import type { CliIo, CliVerb } from "../../cli-io.js";
import { merge } from "./merge.js";
import { plan } from "./plan.js";
import { fitCatalogue } from "./run.js";

/**
 * `horologium batch`: fit a catalogue on all cores (run.ts); `plan` a Slurm job array (plan.ts); `merge`
 * its shards (merge.ts). Each sub-verb parses its own arguments and has its own --help.
 */
export const verb: CliVerb = {
  summary: "fit a whole catalogue on all cores, or as a Slurm job array (plan, merge)",
  async run(args: string[], io: CliIo): Promise<number> {
    if (args[0] === "plan") return plan(args.slice(1), io);
    if (args[0] === "merge") return merge(args.slice(1), io);
    return fitCatalogue(args, io);
  },
};
