/**
 * The Vega-Lite specification types the figure builders compose, under names that say what they are
 * (Vega-Lite exports only `TopLevelSpec` from its main entry; the parts come from its declared
 * `types_unstable` path, types only).
 */
import type { Field } from "vega-lite/types_unstable/channeldef.js";
import type { InlineDataset } from "vega-lite/types_unstable/data.js";
import type { LayerSpec, NonNormalizedSpec, UnitSpec } from "vega-lite/types_unstable/spec/index.js";

/** A view that can stand in a concatenation: a unit, a layer, or a nested composition. */
export type ViewSpec = NonNormalizedSpec;
/** A layered view (marks drawn over each other on shared scales). */
export type LayeredView = LayerSpec<Field>;
/** One member of a layer: a unit view or a nested layer. */
export type LayerMember = LayerSpec<Field>["layer"][number];
/** A single mark with its data, transforms and encoding. */
export type UnitView = UnitSpec<Field>;
/** Rows of inline data, as the figures put in `datasets`. */
export type DataRows = InlineDataset;
