/** The Horologium version recorded in every result (keep in step with package.json). */
export const HOROLOGIUM_VERSION = "0.1.0";
