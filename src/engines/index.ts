// The engines plumbline ships, and the registry of every quantity they declare.
// Adding an engine: import it here. Nothing in the checker or the report names an engine.
import { geometryEngine } from './geometry/index.ts';
import { depositionEngine, fillEngine } from './deposition/index.ts';
import { electricalEngine } from './electrical/index.ts';
import { isolationEngine } from './electrical/isolation.ts';
import { etchEngine } from './etch/index.ts';
import { mechanicsEngine } from './mechanics/index.ts';
import { thermomechEngine } from './thermomech/index.ts';
import { transportEngine } from './transport/index.ts';
import type { Engine, QuantityDef } from './quantity.ts';

export const ENGINES: readonly Engine[] = [geometryEngine, transportEngine, etchEngine, depositionEngine, fillEngine, mechanicsEngine, electricalEngine, isolationEngine, thermomechEngine];

export const QUANTITIES: ReadonlyMap<string, QuantityDef> = new Map(
  ENGINES.flatMap((e) => e.quantities.map((q) => [q.name, q] as const)),
);
